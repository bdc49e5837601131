/**
 * The owner's "best fit" ordering of quotes: cheaper, closer and better-rated installers first.
 * Ratings go through a Bayesian average so a single glowing review cannot outrank a long record
 * of good ones; the formula is shown to owners as {@link BEST_FIT_FORMULA}.
 */

/** Prior belief about an installer's rating before their own reviews count for much. */
export type RatingPrior = { mean: number; weight: number };

/**
 * Tapline's choice of prior: every installer starts as if they had 5 reviews of 4.0 stars.
 * 4.0 sits a little below what most competent tradespeople earn, so new installers are neither
 * buried nor promoted; 5 reviews means roughly the first handful of real reviews decide.
 * Tapline's product decision, not a published figure.
 */
export const DEFAULT_RATING_PRIOR: RatingPrior = { mean: 4.0, weight: 5 };

/** Weights of the three parts of the best-fit score (Tapline's choice; they sum to 1). */
export const BEST_FIT_WEIGHTS = { price: 0.45, distance: 0.2, rating: 0.35 } as const;

export const MIN_STARS = 1;
export const MAX_STARS = 5;

/** Shown to owners next to the "best fit" sort so the ordering is never a black box. */
export const BEST_FIT_FORMULA = [
	'Best fit = 45 % price + 20 % distance + 35 % rating, each scored from 0 to 1.',
	'Price: the cheapest quote scores 1, the dearest 0, others in proportion between.',
	'Distance: an installer next door scores 1, the farthest quoting installer 0.',
	'Rating: a weighted average that counts every installer as starting with 5 reviews of ' +
		'4.0 stars, so (5 x 4.0 + sum of their stars) / (5 + number of reviews), then 1 star ' +
		'scores 0 and 5 stars score 1. One 5-star review gives 4.17, not 5.',
	'Equal scores keep the order the quotes arrived in.'
].join('\n');

/** What the score needs to know about one quote. */
export type QuoteFacts = {
	/** Quote total in cents, GST included. */
	totalCents: number;
	/** Road or straight-line distance from the installer's base to the job, in km. */
	distanceKm: number;
	/** Sum of the installer's review stars (1 to 5 each). */
	ratingSum: number;
	/** Number of reviews. */
	ratingCount: number;
};

/** The spread of the quotes being compared, so price and distance can be scaled to 0..1. */
export type RankingContext = {
	cheapestCents: number;
	priciestCents: number;
	maxDistanceKm: number;
};

/** A best-fit score and the parts it is made of, for showing the owner why. */
export type BestFitScore = {
	score: number;
	priceScore: number;
	distanceScore: number;
	ratingScore: number;
	/** Bayesian average rating in stars. */
	rating: number;
};

/** A quote that can be ranked: its facts plus when it was submitted. */
export type RankableQuote = QuoteFacts & { submittedAt: Date };

/**
 * Bayesian average rating: (m x C + sum of stars) / (m + count), with prior mean C and weight m.
 * @param sumOfStars sum of all review stars
 * @param count number of reviews
 * @param prior prior mean C (stars) and weight m (pseudo-reviews)
 * @returns average in stars, between 1 and 5
 */
export function bayesianRating(
	sumOfStars: number,
	count: number,
	prior: RatingPrior = DEFAULT_RATING_PRIOR
): number {
	if (!Number.isSafeInteger(count) || count < 0) {
		throw new RangeError(`count must be a whole number ≥ 0, got ${String(count)}`);
	}
	if (!Number.isFinite(sumOfStars) || sumOfStars < MIN_STARS * count) {
		throw new RangeError(`sumOfStars must be at least ${String(MIN_STARS)} per review`);
	}
	if (sumOfStars > MAX_STARS * count) {
		throw new RangeError(`sumOfStars must be at most ${String(MAX_STARS)} per review`);
	}
	if (!(prior.weight > 0) || !(prior.mean >= MIN_STARS && prior.mean <= MAX_STARS)) {
		throw new RangeError('prior needs a weight > 0 and a mean between 1 and 5 stars');
	}
	return (prior.weight * prior.mean + sumOfStars) / (prior.weight + count);
}

/**
 * Best-fit score of one quote against the others: weighted sum of price, distance and rating
 * scores, each 0..1 (see {@link BEST_FIT_FORMULA}).
 * @param quote the quote's total, distance and the installer's reviews
 * @param context cheapest and dearest totals and the largest distance among the quotes
 */
export function bestFitScore(quote: QuoteFacts, context: RankingContext): BestFitScore {
	const { cheapestCents, priciestCents, maxDistanceKm } = context;
	if (priciestCents < cheapestCents) throw new RangeError('priciestCents is below cheapestCents');
	if (!(maxDistanceKm >= 0)) throw new RangeError('maxDistanceKm must be ≥ 0');
	if (!(quote.distanceKm >= 0)) throw new RangeError('distanceKm must be ≥ 0');
	// When every quote has the same price (or distance) that part cannot separate them, so all
	// score the full 1 rather than dividing by zero.
	const priceScore =
		priciestCents === cheapestCents
			? 1
			: clamp01((priciestCents - quote.totalCents) / (priciestCents - cheapestCents));
	const distanceScore = maxDistanceKm === 0 ? 1 : clamp01(1 - quote.distanceKm / maxDistanceKm);
	const rating = bayesianRating(quote.ratingSum, quote.ratingCount);
	const ratingScore = (rating - MIN_STARS) / (MAX_STARS - MIN_STARS);
	const score =
		BEST_FIT_WEIGHTS.price * priceScore +
		BEST_FIT_WEIGHTS.distance * distanceScore +
		BEST_FIT_WEIGHTS.rating * ratingScore;
	return { score, priceScore, distanceScore, ratingScore, rating };
}

/**
 * Sorts quotes by best-fit score, highest first. Ties (to 1e-9) go to the quote submitted
 * earlier, then to input order, so the ordering never flickers between page loads.
 * @param quotes the quotes on one job
 * @returns new array of the quotes, each with its score under `fit`
 */
export function rankQuotes<T extends RankableQuote>(
	quotes: readonly T[]
): Array<T & { fit: BestFitScore }> {
	if (quotes.length === 0) return [];
	const totals = quotes.map((quote) => quote.totalCents);
	const context: RankingContext = {
		cheapestCents: Math.min(...totals),
		priciestCents: Math.max(...totals),
		maxDistanceKm: Math.max(...quotes.map((quote) => quote.distanceKm))
	};
	return quotes
		.map((quote, index) => ({ quote, index, fit: bestFitScore(quote, context) }))
		.sort(
			(a, b) =>
				// Rounded so scores that are equal on paper but differ in the last float bit tie.
				roundScore(b.fit.score) - roundScore(a.fit.score) ||
				a.quote.submittedAt.getTime() - b.quote.submittedAt.getTime() ||
				a.index - b.index
		)
		.map(({ quote, fit }) => ({ ...quote, fit }));
}

function roundScore(score: number): number {
	return Math.round(score * 1e9);
}

function clamp01(value: number): number {
	return Math.min(1, Math.max(0, value));
}

/**
 * The owner's "best fit" ordering of quotes: cheaper, closer and better-rated installers first.
 * Each quote is scored on its own, on fixed scales (price against the job's own price guide,
 * distance by a fixed decay, rating by a Bayesian average with a stated prior), never against
 * the other quotes, so adding or withdrawing one quote never reorders two others. The words shown
 * to owners ({@link bestFitFormula}) are built from the same constants and functions.
 */
import { formatAud } from '../money/money';

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

/**
 * Price score = PRICE_SCORE_OFFSET − total ÷ reference, kept between 0 and 1, where the
 * reference is the middle of the job's price guide: a quote at the guide scores 0.5, each 10 %
 * cheaper or dearer moves it by 0.1 (Tapline's choice: wide enough that real quotes spread out,
 * and a one-dollar difference moves the score by about 0.0002 on a $500 job).
 */
export const PRICE_SCORE_OFFSET = 1.5;

/** Distance score = 1 ÷ (1 + km ÷ this): halves at 10 km (Tapline's choice, a metro trip). */
export const DISTANCE_HALF_SCORE_KM = 10;

export const MIN_STARS = 1;
export const MAX_STARS = 5;

/** What the score needs to know about one quote. */
export type QuoteFacts = {
	/** Quote total in cents, what the owner pays. */
	totalCents: number;
	/** Road or straight-line distance from the installer's base to the job, in km. */
	distanceKm: number;
	/** Sum of the installer's review stars (1 to 5 each). */
	ratingSum: number;
	/** Number of reviews. */
	ratingCount: number;
};

/** A best-fit score and the parts it is made of, for showing the owner why. */
export type BestFitScore = {
	score: number;
	priceScore: number;
	distanceScore: number;
	ratingScore: number;
	/** Adjusted (Bayesian average) rating in stars. */
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

/** An installer's rating as the owner sees it: adjusted, with the plain average and count. */
export type RatingSummary = {
	adjusted: number;
	/** Plain average of the reviews; null with none. */
	average: number | null;
	count: number;
	/** E.g. '4.17 ★ adjusted (average 5.00 from 1 review)'. */
	label: string;
};

/**
 * The rating to show beside a quote, labelled as adjusted, with the plain average and the number
 * of reviews it comes from.
 * @param sumOfStars sum of all review stars
 * @param count number of reviews
 */
export function ratingSummary(sumOfStars: number, count: number): RatingSummary {
	const adjusted = bayesianRating(sumOfStars, count);
	if (count === 0) {
		return {
			adjusted,
			average: null,
			count,
			label: `No reviews yet (ranked at the starting ${adjusted.toFixed(2)} ★ adjusted)`
		};
	}
	const average = sumOfStars / count;
	return {
		adjusted,
		average,
		count,
		label: `${adjusted.toFixed(2)} ★ adjusted (average ${average.toFixed(2)} from ${String(count)} review${count === 1 ? '' : 's'})`
	};
}

/**
 * The price reference for a job: the middle of its price guide, or null without one.
 * @param guide the guide's low and high totals in cents
 */
export function priceReferenceCents(
	guide: { lowCents: number | null; highCents: number | null } | null
): number | null {
	if (!guide || guide.lowCents === null || guide.highCents === null) return null;
	const reference = Math.round((guide.lowCents + guide.highCents) / 2);
	return reference > 0 ? reference : null;
}

/**
 * Price score, 0..1: {@link PRICE_SCORE_OFFSET} − total ÷ reference, clamped. Without a
 * reference every quote scores 0.5, so price does not separate them.
 * @param totalCents the quote's total
 * @param referenceCents the middle of the job's price guide
 */
export function priceScore(totalCents: number, referenceCents: number | null): number {
	if (!(totalCents >= 0)) throw new RangeError('totalCents must be ≥ 0');
	if (referenceCents === null) return 0.5;
	if (!(referenceCents > 0)) throw new RangeError('referenceCents must be > 0');
	return clamp01(PRICE_SCORE_OFFSET - totalCents / referenceCents);
}

/**
 * Distance score, 0..1: 1 ÷ (1 + km ÷ {@link DISTANCE_HALF_SCORE_KM}).
 * @param distanceKm the installer's distance from the job
 */
export function distanceScore(distanceKm: number): number {
	if (!(distanceKm >= 0) || !Number.isFinite(distanceKm)) {
		throw new RangeError('distanceKm must be ≥ 0');
	}
	return 1 / (1 + distanceKm / DISTANCE_HALF_SCORE_KM);
}

/**
 * Best-fit score of one quote: weighted sum of its price, distance and rating scores, each 0..1
 * and each depending on this quote alone (see {@link bestFitFormula}).
 * @param quote the quote's total, distance and the installer's reviews
 * @param referenceCents the middle of the job's price guide, or null without one
 */
export function bestFitScore(quote: QuoteFacts, referenceCents: number | null): BestFitScore {
	const price = priceScore(quote.totalCents, referenceCents);
	const distance = distanceScore(quote.distanceKm);
	const rating = bayesianRating(quote.ratingSum, quote.ratingCount);
	const ratingScore = (rating - MIN_STARS) / (MAX_STARS - MIN_STARS);
	const score =
		BEST_FIT_WEIGHTS.price * price +
		BEST_FIT_WEIGHTS.distance * distance +
		BEST_FIT_WEIGHTS.rating * ratingScore;
	return { score, priceScore: price, distanceScore: distance, ratingScore, rating };
}

/**
 * Sorts quotes by best-fit score, highest first. Ties (to 1e-9) go to the quote submitted
 * earlier, then to input order, so the ordering never flickers between page loads.
 * @param quotes the quotes on one job
 * @param referenceCents the middle of the job's price guide, or null without one
 * @returns new array of the quotes, each with its score under `fit`
 */
export function rankQuotes<T extends RankableQuote>(
	quotes: readonly T[],
	referenceCents: number | null
): Array<T & { fit: BestFitScore }> {
	return quotes
		.map((quote, index) => ({ quote, index, fit: bestFitScore(quote, referenceCents) }))
		.sort(
			(a, b) =>
				// Rounded so scores that are equal on paper but differ in the last float bit tie.
				roundScore(b.fit.score) - roundScore(a.fit.score) ||
				a.quote.submittedAt.getTime() - b.quote.submittedAt.getTime() ||
				a.index - b.index
		)
		.map(({ quote, fit }) => ({ ...quote, fit }));
}

/**
 * The best-fit formula in words for the owner, one line each, with worked figures computed by
 * the same functions the ranking uses, so the words cannot drift from the code.
 * @param referenceCents the middle of the job's price guide, or null without one
 */
export function bestFitFormula(referenceCents: number | null): string[] {
	const pct = (weight: number) => `${String(Math.round(weight * 100))} %`;
	const two = (n: number) => n.toFixed(2);
	const { mean, weight } = DEFAULT_RATING_PRIOR;
	const price =
		referenceCents === null
			? 'Price: this job has no price guide, so price scores 0.50 for every quote.'
			: `Price: ${String(PRICE_SCORE_OFFSET)} − the quote's total ÷ ${formatAud(referenceCents)} ` +
				"(the middle of this job's price guide), kept between 0 and 1: a quote at the guide " +
				`scores ${two(priceScore(referenceCents, referenceCents))}, one 20 % cheaper ` +
				`${two(priceScore(referenceCents * 0.8, referenceCents))}, one 20 % dearer ` +
				`${two(priceScore(referenceCents * 1.2, referenceCents))}.`;
	return [
		`Best fit = ${pct(BEST_FIT_WEIGHTS.price)} price + ${pct(BEST_FIT_WEIGHTS.distance)} distance + ` +
			`${pct(BEST_FIT_WEIGHTS.rating)} rating, each scored from 0 to 1. Every quote is scored ` +
			'on its own, so a quote arriving or being withdrawn never changes the order of the others.',
		price,
		`Distance: 1 ÷ (1 + km ÷ ${String(DISTANCE_HALF_SCORE_KM)}): next door scores ` +
			`${two(distanceScore(0))}, ${String(DISTANCE_HALF_SCORE_KM)} km ${two(distanceScore(DISTANCE_HALF_SCORE_KM))}, ` +
			`30 km ${two(distanceScore(30))}.`,
		`Rating: an adjusted average that counts every installer as starting with ${String(weight)} ` +
			`reviews of ${mean.toFixed(1)} stars: (${String(weight)} × ${mean.toFixed(1)} + the sum of ` +
			`their stars) ÷ (${String(weight)} + the number of reviews); 1 star scores 0 and 5 stars 1. ` +
			`One 5-star review gives ${two(bayesianRating(5, 1))} adjusted, not 5. The table shows the ` +
			'adjusted rating with the plain average and the number of reviews.',
		'Equal scores keep the order the quotes arrived in.'
	];
}

function roundScore(score: number): number {
	return Math.round(score * 1e9);
}

function clamp01(value: number): number {
	return Math.min(1, Math.max(0, value));
}

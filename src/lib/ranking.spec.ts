import { describe, expect, it } from 'vitest';
import {
	BEST_FIT_FORMULA,
	BEST_FIT_WEIGHTS,
	DEFAULT_RATING_PRIOR,
	bayesianRating,
	bestFitScore,
	rankQuotes,
	type RankableQuote
} from './ranking';

// The prior (4.0 stars, weight 5) and the weights (0.45 / 0.2 / 0.35) are Tapline's own choices;
// the arithmetic below is worked by hand from the formula (a Bayesian average with a stated
// prior, the usual alternative to a Wilson score interval for small review counts).

describe('bayesianRating', () => {
	it('one 5-star review does not beat forty 4.5-star reviews', () => {
		// Worked by hand: (5 x 4.0 + 5) / (5 + 1) = 25 / 6 = 4.1667 stars.
		const oneReview = bayesianRating(5, 1);
		// Worked by hand: (5 x 4.0 + 40 x 4.5) / (5 + 40) = 200 / 45 = 4.4444 stars.
		const fortyReviews = bayesianRating(180, 40);
		expect(oneReview).toBeCloseTo(25 / 6, 12);
		expect(fortyReviews).toBeCloseTo(200 / 45, 12);
		expect(fortyReviews).toBeGreaterThan(oneReview);
	});

	it('is the prior mean with no reviews and approaches the raw mean with many', () => {
		expect(bayesianRating(0, 0)).toBe(DEFAULT_RATING_PRIOR.mean);
		// Worked by hand: (20 + 1000 x 4.8) / 1005 = 4820 / 1005 = 4.7960.
		expect(bayesianRating(4800, 1000)).toBeCloseTo(4.796, 3);
		// A custom prior: (10 x 3 + 10) / (10 + 2) = 40 / 12 = 3.3333.
		expect(bayesianRating(10, 2, { mean: 3, weight: 10 })).toBeCloseTo(40 / 12, 12);
	});

	it('refuses impossible star totals', () => {
		expect(() => bayesianRating(11, 2)).toThrow(RangeError);
		expect(() => bayesianRating(1, 2)).toThrow(RangeError);
		expect(() => bayesianRating(3, 1.5)).toThrow(RangeError);
	});
});

describe('bestFitScore and rankQuotes', () => {
	const base = new Date('2026-05-01T00:00:00Z').getTime();
	const at = (minutes: number) => new Date(base + minutes * 60_000);

	// Three quotes on one job. Context: cheapest 25 000 c, dearest 35 000 c, farthest 15 km.
	const quoteA: RankableQuote = {
		totalCents: 30_000,
		distanceKm: 5,
		ratingSum: 45,
		ratingCount: 10,
		submittedAt: at(0)
	};
	const quoteB: RankableQuote = {
		totalCents: 25_000,
		distanceKm: 15,
		ratingSum: 0,
		ratingCount: 0,
		submittedAt: at(10)
	};
	const quoteC: RankableQuote = {
		totalCents: 35_000,
		distanceKm: 2,
		ratingSum: 98,
		ratingCount: 20,
		submittedAt: at(20)
	};
	const context = { cheapestCents: 25_000, priciestCents: 35_000, maxDistanceKm: 15 };

	it('scores a three-quote example as worked by hand', () => {
		// A: price (35 000 − 30 000) / 10 000 = 0.5; distance 1 − 5/15 = 0.6667;
		//    rating (20 + 45) / 15 = 4.3333 stars -> (4.3333 − 1) / 4 = 0.8333;
		//    score 0.45 x 0.5 + 0.2 x 0.6667 + 0.35 x 0.8333 = 0.225 + 0.1333 + 0.2917 = 0.65.
		const a = bestFitScore(quoteA, context);
		expect(a.priceScore).toBeCloseTo(0.5, 12);
		expect(a.distanceScore).toBeCloseTo(2 / 3, 12);
		expect(a.rating).toBeCloseTo(13 / 3, 12);
		expect(a.ratingScore).toBeCloseTo(5 / 6, 12);
		expect(a.score).toBeCloseTo(0.65, 12);
		// B: price 1; distance 0; no reviews -> 4.0 stars -> 0.75;
		//    score 0.45 + 0 + 0.35 x 0.75 = 0.45 + 0.2625 = 0.7125.
		expect(bestFitScore(quoteB, context).score).toBeCloseTo(0.7125, 12);
		// C: price 0; distance 1 − 2/15 = 0.8667; rating (20 + 98) / 25 = 4.72 -> 0.93;
		//    score 0 + 0.1733 + 0.3255 = 0.49883.
		expect(bestFitScore(quoteC, context).score).toBeCloseTo(0.498833, 6);

		const ranked = rankQuotes([quoteA, quoteB, quoteC]);
		expect(ranked.map((quote) => quote.totalCents)).toEqual([25_000, 30_000, 35_000]);
		expect(ranked[0]?.fit.score).toBeCloseTo(0.7125, 12);
	});

	it('keeps input order for identical quotes submitted at the same time', () => {
		const first = { ...quoteA, id: 'first' };
		const second = { ...quoteA, id: 'second' };
		const third = { ...quoteA, id: 'third' };
		expect(rankQuotes([first, second, third]).map((q) => q.id)).toEqual([
			'first',
			'second',
			'third'
		]);
		expect(rankQuotes([third, first, second]).map((q) => q.id)).toEqual([
			'third',
			'first',
			'second'
		]);
	});

	it('puts the earlier-submitted quote first when scores are equal on paper', () => {
		// Context: cheapest 20 000, dearest 40 000, farthest 20 km; all three rated alike.
		// early:  price 1,   distance 1 − 18/20 = 0.1 -> 0.45 + 0.02 = 0.47 (+ rating part)
		// late:   price 0.6, distance 1            -> 0.27 + 0.2  = 0.47 (+ rating part)
		const rated = { ratingSum: 40, ratingCount: 10 };
		const late = { ...rated, id: 'late', totalCents: 28_000, distanceKm: 0, submittedAt: at(30) };
		const early = { ...rated, id: 'early', totalCents: 20_000, distanceKm: 18, submittedAt: at(5) };
		const dear = { ...rated, id: 'dear', totalCents: 40_000, distanceKm: 20, submittedAt: at(1) };
		const ranked = rankQuotes([late, dear, early]);
		expect(ranked[0]?.fit.score).toBeCloseTo(ranked[1]?.fit.score ?? Number.NaN, 12);
		expect(ranked.map((q) => q.id)).toEqual(['early', 'late', 'dear']);
	});

	it('gives every quote the full price and distance score when they cannot separate', () => {
		const same = bestFitScore(quoteA, {
			cheapestCents: 30_000,
			priciestCents: 30_000,
			maxDistanceKm: 0
		});
		expect([same.priceScore, same.distanceScore]).toEqual([1, 1]);
		expect(same.score).toBeCloseTo(0.45 + 0.2 + 0.35 * (5 / 6), 12);
		expect(rankQuotes([])).toEqual([]);
	});

	it('explains the same weights and prior that the code uses', () => {
		expect(BEST_FIT_WEIGHTS.price + BEST_FIT_WEIGHTS.distance + BEST_FIT_WEIGHTS.rating).toBe(1);
		expect(BEST_FIT_FORMULA).toContain(`${String(BEST_FIT_WEIGHTS.price * 100)} % price`);
		expect(BEST_FIT_FORMULA).toContain(`${String(BEST_FIT_WEIGHTS.distance * 100)} % distance`);
		expect(BEST_FIT_FORMULA).toContain(`${String(BEST_FIT_WEIGHTS.rating * 100)} % rating`);
		expect(BEST_FIT_FORMULA).toContain(
			`${String(DEFAULT_RATING_PRIOR.weight)} reviews of ${DEFAULT_RATING_PRIOR.mean.toFixed(1)} stars`
		);
	});
});

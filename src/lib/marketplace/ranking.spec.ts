import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	BEST_FIT_WEIGHTS,
	DEFAULT_RATING_PRIOR,
	bayesianRating,
	bestFitFormula,
	bestFitScore,
	distanceScore,
	priceReferenceCents,
	priceScore,
	rankQuotes,
	ratingSummary,
	type RankableQuote
} from './ranking';

// The prior (4.0 stars, weight 5), the weights (0.45 / 0.2 / 0.35) and the scales (price 1.5 −
// total ÷ guide middle, distance halving at 10 km) are Tapline's own choices; the arithmetic
// below is worked by hand from the formula (a Bayesian average with a stated prior, the usual
// alternative to a Wilson score interval for small review counts).

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

describe('ratingSummary', () => {
	it('labels the adjusted rating as adjusted, with the plain average and the count', () => {
		// Worked by hand: one 5-star review -> 25 / 6 = 4.17 adjusted, average 5.00.
		expect(ratingSummary(5, 1)).toEqual({
			adjusted: 25 / 6,
			average: 5,
			count: 1,
			label: '4.17 ★ adjusted (average 5.00 from 1 review)'
		});
		// Worked by hand: forty 4.5-star reviews -> 200 / 45 = 4.44 adjusted, average 4.50.
		expect(ratingSummary(180, 40).label).toBe('4.44 ★ adjusted (average 4.50 from 40 reviews)');
		expect(ratingSummary(0, 0)).toMatchObject({
			average: null,
			count: 0,
			label: 'No reviews yet (ranked at the starting 4.00 ★ adjusted)'
		});
	});
});

describe('priceScore, distanceScore and priceReferenceCents', () => {
	it('scores price against the job’s own guide', () => {
		// Worked by hand: 1.5 − total / reference, clamped to 0..1.
		expect(priceScore(40_000, 40_000)).toBeCloseTo(0.5, 12);
		expect(priceScore(30_000, 40_000)).toBeCloseTo(0.75, 12);
		expect(priceScore(60_000, 40_000)).toBe(0);
		expect(priceScore(10_000, 40_000)).toBe(1);
		// A one-dollar difference moves the score by 100 / 40 000 = 0.0025, not the whole weight.
		expect(priceScore(40_000, 40_000) - priceScore(40_100, 40_000)).toBeCloseTo(0.0025, 12);
		// No guide: price cannot separate quotes.
		expect(priceScore(12_345, null)).toBe(0.5);
		expect(() => priceScore(100, 0)).toThrow(RangeError);
	});

	it('decays distance by a fixed scale', () => {
		// Worked by hand: 1 / (1 + km / 10).
		expect(distanceScore(0)).toBe(1);
		expect(distanceScore(10)).toBeCloseTo(0.5, 12);
		expect(distanceScore(30)).toBeCloseTo(0.25, 12);
		expect(() => distanceScore(-1)).toThrow(RangeError);
		expect(() => distanceScore(Number.NaN)).toThrow(RangeError);
	});

	it('takes the middle of the price guide as the reference', () => {
		// Worked by hand: (35 000 + 45 001) / 2 = 40 000.5 -> 40 001 (half up).
		expect(priceReferenceCents({ lowCents: 35_000, highCents: 45_001 })).toBe(40_001);
		expect(priceReferenceCents({ lowCents: null, highCents: 45_000 })).toBeNull();
		expect(priceReferenceCents(null)).toBeNull();
	});
});

describe('bestFitScore and rankQuotes', () => {
	const base = new Date('2026-05-01T00:00:00Z').getTime();
	const at = (minutes: number) => new Date(base + minutes * 60_000);
	const REFERENCE = 40_000;

	// Three quotes on a job whose price guide has its middle at $400.
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

	it('scores a three-quote example as worked by hand', () => {
		// A: price 1.5 − 30 000 / 40 000 = 0.75; distance 1 / (1 + 5/10) = 0.6667;
		//    rating (20 + 45) / 15 = 4.3333 stars -> (4.3333 − 1) / 4 = 0.8333;
		//    score 0.45 x 0.75 + 0.2 x 0.6667 + 0.35 x 0.8333 = 0.3375 + 0.1333 + 0.2917 = 0.7625.
		const a = bestFitScore(quoteA, REFERENCE);
		expect(a.priceScore).toBeCloseTo(0.75, 12);
		expect(a.distanceScore).toBeCloseTo(2 / 3, 12);
		expect(a.rating).toBeCloseTo(13 / 3, 12);
		expect(a.ratingScore).toBeCloseTo(5 / 6, 12);
		expect(a.score).toBeCloseTo(0.7625, 12);
		// B: price 1.5 − 0.625 = 0.875; distance 1 / 2.5 = 0.4; no reviews -> 4.0 stars -> 0.75;
		//    score 0.39375 + 0.08 + 0.2625 = 0.73625.
		expect(bestFitScore(quoteB, REFERENCE).score).toBeCloseTo(0.73625, 12);
		// C: price 1.5 − 0.875 = 0.625; distance 1 / 1.2 = 0.8333; rating (20 + 98) / 25 = 4.72
		//    -> 0.93; score 0.28125 + 0.16667 + 0.3255 = 0.773417.
		expect(bestFitScore(quoteC, REFERENCE).score).toBeCloseTo(0.773417, 6);

		const ranked = rankQuotes([quoteA, quoteB, quoteC], REFERENCE);
		expect(ranked.map((quote) => quote.totalCents)).toEqual([35_000, 30_000, 25_000]);
		expect(ranked[0]?.fit.score).toBeCloseTo(0.773417, 6);
	});

	it('does not let an unrelated expensive quote flip two others', () => {
		// The case the earlier min–max scaling got wrong: X is $1 dearer than Y but much closer.
		// On fixed scales, X: 0.45 x (1.5 − 40 100 / 40 000) + 0.2 x (1 / 1.2) = 0.22388 + 0.16667;
		// Y: 0.45 x 0.5 + 0.2 x (1 / 2.2) = 0.225 + 0.09091. X leads whoever else quotes.
		const rated = { ratingSum: 40, ratingCount: 10 };
		const x = { ...rated, id: 'x', totalCents: 40_100, distanceKm: 2, submittedAt: at(1) };
		const y = { ...rated, id: 'y', totalCents: 40_000, distanceKm: 12, submittedAt: at(2) };
		const dear = { ...rated, id: 'dear', totalCents: 90_000, distanceKm: 40, submittedAt: at(3) };
		const order = (quotes: Array<typeof x>) =>
			rankQuotes(quotes, REFERENCE)
				.map((q) => q.id)
				.filter((id) => id !== 'dear');
		expect(order([x, y])).toEqual(['x', 'y']);
		expect(order([x, y, dear])).toEqual(['x', 'y']);
	});

	it('keeps input order for identical quotes submitted at the same time', () => {
		const first = { ...quoteA, id: 'first' };
		const second = { ...quoteA, id: 'second' };
		const third = { ...quoteA, id: 'third' };
		expect(rankQuotes([first, second, third], REFERENCE).map((q) => q.id)).toEqual([
			'first',
			'second',
			'third'
		]);
		expect(rankQuotes([third, first, second], REFERENCE).map((q) => q.id)).toEqual([
			'third',
			'first',
			'second'
		]);
		expect(rankQuotes([], REFERENCE)).toEqual([]);
	});

	it('puts the earlier-submitted quote first when scores are equal on paper', () => {
		// Two quotes alike but for when they arrived, the later one given first. Worked by hand:
		// 0.45 x (1.5 − 32 000 / 40 000) + 0.2 x 1 / (1 + 10/10) + 0.35 x 0.75
		// = 0.315 + 0.1 + 0.2625 = 0.6775 each.
		const rated = { ratingSum: 40, ratingCount: 10, totalCents: 32_000, distanceKm: 10 };
		const late = { ...rated, id: 'late', submittedAt: at(30) };
		const early = { ...rated, id: 'early', submittedAt: at(5) };
		const ranked = rankQuotes([late, early], REFERENCE);
		expect(ranked[0]?.fit.score).toBeCloseTo(0.6775, 12);
		expect(ranked.map((q) => q.id)).toEqual(['early', 'late']);
	});

	it('never reorders two quotes when a third is added or withdrawn (property)', () => {
		// Property of scoring each quote on its own scales; checked on random quotes.
		const quoteArb = fc
			.record({
				totalCents: fc.integer({ min: 1_000, max: 500_000 }),
				distanceKm: fc.double({ min: 0, max: 200, noNaN: true }),
				ratingCount: fc.integer({ min: 0, max: 50 }),
				starsFraction: fc.double({ min: 0, max: 1, noNaN: true }),
				minute: fc.integer({ min: 0, max: 10_000 })
			})
			.map(({ totalCents, distanceKm, ratingCount, starsFraction, minute }) => ({
				totalCents,
				distanceKm,
				ratingCount,
				ratingSum: ratingCount + Math.round(starsFraction * 4 * ratingCount),
				submittedAt: at(minute)
			}));
		fc.assert(
			fc.property(
				fc.array(quoteArb, { minLength: 2, maxLength: 8 }),
				quoteArb,
				fc.option(fc.integer({ min: 5_000, max: 300_000 }), { nil: null }),
				fc.nat(),
				(quotes, extra, reference, pick) => {
					const labelled = quotes.map((q, i) => ({ ...q, id: i }));
					const order = (list: typeof labelled) => rankQuotes(list, reference).map((q) => q.id);
					const before = order(labelled);
					// Adding one quote (anywhere in the input) leaves the others in the same order.
					const added = [...labelled];
					added.splice(pick % (labelled.length + 1), 0, { ...extra, id: -1 });
					expect(order(added).filter((id) => id !== -1)).toEqual(before);
					// Withdrawing one leaves the rest in the same order.
					const gone = pick % labelled.length;
					expect(order(labelled.filter((q) => q.id !== gone))).toEqual(
						before.filter((id) => id !== gone)
					);
				}
			),
			{ numRuns: 300 }
		);
	});
});

describe('bestFitFormula', () => {
	it('states the weights, scales and prior the code uses, with worked figures', () => {
		const lines = bestFitFormula(40_000);
		expect(BEST_FIT_WEIGHTS.price + BEST_FIT_WEIGHTS.distance + BEST_FIT_WEIGHTS.rating).toBe(1);
		expect(lines[0]).toContain('45 % price + 20 % distance + 35 % rating');
		expect(lines[0]).toContain('never changes the order of the others');
		// Worked by hand: 1.5 − 1 = 0.50; 1.5 − 0.8 = 0.70; 1.5 − 1.2 = 0.30.
		expect(lines[1]).toContain('÷ $400.00');
		expect(lines[1]).toContain('scores 0.50, one 20 % cheaper 0.70, one 20 % dearer 0.30');
		// Worked by hand: 1 / (1 + 0) = 1; 1 / (1 + 1) = 0.5; 1 / (1 + 3) = 0.25.
		expect(lines[2]).toBe(
			'Distance: 1 ÷ (1 + km ÷ 10): next door scores 1.00, 10 km 0.50, 30 km 0.25.'
		);
		// Worked by hand: (5 x 4.0 + 5) / 6 = 4.17.
		expect(lines[3]).toContain('starting with 5 reviews of 4.0 stars');
		expect(lines[3]).toContain('One 5-star review gives 4.17 adjusted');
		expect(bestFitFormula(null)[1]).toBe(
			'Price: this job has no price guide, so price scores 0.50 for every quote.'
		);
	});
});

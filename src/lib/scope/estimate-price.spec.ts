import { describe, expect, it } from 'vitest';
import { computeScope } from './index';
import { DEMO_WAGON_JOB } from './demo-job';
import { estimatePriceRange, MIN_MARKET_QUOTES, percentileCont } from './estimate-price';

const guide = computeScope(DEMO_WAGON_JOB).price;

describe('percentileCont', () => {
	it('interpolates between ranks as percentile_cont does (hand-computed)', () => {
		// Ranks 0..3; the 25th percentile sits at rank 0.75: 100 + 0.75 × 100 = 175.
		expect(percentileCont([400, 100, 300, 200], 0.25)).toBe(175);
		// The 75th at rank 2.25: 300 + 0.25 × 100 = 325.
		expect(percentileCont([400, 100, 300, 200], 0.75)).toBe(325);
		expect(percentileCont([42], 0.25)).toBe(42);
	});

	it('refuses an empty list', () => {
		expect(() => percentileCont([], 0.5)).toThrow(RangeError);
	});
});

describe('estimatePriceRange', () => {
	it('shows the market middle half with its count when there are enough quotes', () => {
		const range = estimatePriceRange(
			{ p25Cents: 45000.4, p75Cents: 61000.6, count: MIN_MARKET_QUOTES },
			guide
		);
		expect(range).toEqual({ source: 'market', totalIncGst: { min: 45000, max: 61001 }, count: 5 });
	});

	it('falls back to the guide, said as such, below the minimum', () => {
		const range = estimatePriceRange(
			{ p25Cents: 1, p75Cents: 2, count: MIN_MARKET_QUOTES - 1 },
			guide
		);
		expect(range).toEqual({
			source: 'guide',
			totalIncGst: guide.totalIncGst,
			count: MIN_MARKET_QUOTES - 1
		});
		expect(estimatePriceRange(null, guide).count).toBe(0);
	});
});

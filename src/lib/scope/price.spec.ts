import { describe, expect, it } from 'vitest';
import type { LabourEstimate } from './labour';
import type { Part } from './parts';
import { ADELAIDE_MARKET, labourCostCents, priceGuide, type Market } from './price';

// A made-up market with round numbers so the expected values can be checked by hand.
const ROUND_MARKET: Market = {
	...ADELAIDE_MARKET,
	code: 'test',
	name: 'Test',
	labourRateCentsPerHour: 12_000,
	partPricesCents: {
		...ADELAIDE_MARKET.partPricesCents,
		'fuse-tap-mini': 500,
		'accessory-fuse': 100
	}
};

const LABOUR: LabourEstimate = { lines: [], minMinutes: 30, maxMinutes: 60 };
const PARTS: Part[] = [
	{ code: 'fuse-tap-mini', label: 'Fuse tap', quantity: 2 },
	{ code: 'accessory-fuse', label: 'Fuse', quantity: 2 }
];

describe('labourCostCents', () => {
	it('costs minutes at the hourly rate, rounded half up', () => {
		// Source: our stated rule; 12000 c/h x 30 min / 60 = 6000 c.
		expect(labourCostCents(12_000, 30)).toBe(6_000);
		// Source: our stated rule; 9999 c/h x 10 / 60 = 1666.5 -> 1667 (half up).
		expect(labourCostCents(9_999, 10)).toBe(1_667);
		// Source: our stated rule; 10001 c/h x 7 / 60 = 1166.78 -> 1167.
		expect(labourCostCents(10_001, 7)).toBe(1_167);
	});
});

describe('priceGuide', () => {
	it('adds GST to labour + parts and shows the GST inside', () => {
		// Worked by hand: labour 6000–12000 c; parts 2 x 500 + 2 x 100 = 1200 c (ex GST).
		// Min ex GST 7200 -> +10 % (ATO) = 7920; GST inside = 7920 / 11 = 720 (ATO 1/11 rule).
		// Max ex GST 13200 -> 14520; GST 1320.
		const guide = priceGuide(LABOUR, PARTS, ROUND_MARKET);
		expect(guide.labourExGst).toEqual({ min: 6_000, max: 12_000 });
		expect(guide.partsExGst).toBe(1_200);
		expect(guide.totalIncGst).toEqual({ min: 7_920, max: 14_520 });
		expect(guide.gstIncluded).toEqual({ min: 720, max: 1_320 });
		expect(guide.currency).toBe('AUD');
	});

	it('adds an installer-supplied camera at the GST-inclusive budget', () => {
		// Worked by hand: 7920 + 25000 = 32920; GST inside = 32920 / 11 = 2992.7 -> 2993
		// (ATO 1/11 rule, rounded half up).
		const parts: Part[] = [...PARTS, { code: 'camera', label: 'Camera', quantity: 1 }];
		const guide = priceGuide(LABOUR, parts, ROUND_MARKET, 25_000);
		expect(guide.cameraIncGst).toBe(25_000);
		expect(guide.partsExGst).toBe(1_200);
		expect(guide.totalIncGst.min).toBe(32_920);
		expect(guide.gstIncluded.min).toBe(2_993);
	});

	it('rounds the GST on an odd amount half up', () => {
		// Worked by hand: 12000 c/h x 1 min / 60 = 200 c; + 5 c part = 205 ex GST;
		// GST 20.5 -> 21 (half up), total 226; GST inside 226 / 11 = 20.55 -> 21 (ATO 1/11).
		const market: Market = {
			...ROUND_MARKET,
			partPricesCents: { ...ROUND_MARKET.partPricesCents, 'cable-ties': 5 }
		};
		const guide = priceGuide(
			{ lines: [], minMinutes: 1, maxMinutes: 1 },
			[{ code: 'cable-ties', label: 'Ties', quantity: 1 }],
			market
		);
		expect(guide.totalIncGst).toEqual({ min: 226, max: 226 });
		expect(guide.gstIncluded).toEqual({ min: 21, max: 21 });
	});

	it('rejects a fractional part price', () => {
		// Source: house rule — money is integer cents.
		const market: Market = {
			...ROUND_MARKET,
			partPricesCents: { ...ROUND_MARKET.partPricesCents, 'cable-ties': 9.5 }
		};
		expect(() =>
			priceGuide(LABOUR, [{ code: 'cable-ties', label: 'Ties', quantity: 1 }], market)
		).toThrow(RangeError);
	});

	it('uses whole-cent prices in the demo market', () => {
		// Source: house rule — money is integer cents; GST 10 % (ATO).
		expect(ADELAIDE_MARKET.gstRateBasisPoints).toBe(1000);
		expect(ADELAIDE_MARKET.timeZone).toBe('Australia/Adelaide');
		for (const cents of Object.values(ADELAIDE_MARKET.partPricesCents)) {
			expect(Number.isSafeInteger(cents) && cents > 0).toBe(true);
		}
	});
});

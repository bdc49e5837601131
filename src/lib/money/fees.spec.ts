import { describe, expect, it } from 'vitest';
import { DEFAULT_FEE, feeRuleText, feeSettingsFrom, releaseSplit } from './fees';

describe('releaseSplit', () => {
	it('takes 10 % of $550.00: fee $55.00 with $5.00 GST, $495.00 to the installer', () => {
		// Rule: the payments issue (percentage fee with a minimum). GST: Australian Taxation
		// Office, GST is 1/11 of a GST-inclusive price: 5500 / 11 = 500.
		expect(releaseSplit(55_000, { percentBasisPoints: 1000, minimumCents: 1500 })).toEqual({
			totalCents: 55_000,
			feeCents: 5500,
			gstOnFeeCents: 500,
			payoutCents: 49_500
		});
	});

	it('applies the minimum on a small job: $100.00 pays a $15.00 fee with $1.36 GST', () => {
		// 10 % would be $10.00, under the $15.00 minimum. ATO: 1500 / 11 = 136.36… → 136 (half up).
		expect(releaseSplit(10_000, { percentBasisPoints: 1000, minimumCents: 1500 })).toEqual({
			totalCents: 10_000,
			feeCents: 1500,
			gstOnFeeCents: 136,
			payoutCents: 8500
		});
	});

	it('rounds the percentage half up to the cent: 12.5 % of $123.45 is $15.43', () => {
		// 12345 × 0.125 = 1543.125 → 1543; ATO 1/11 of 1543 = 140.27… → 140.
		const split = releaseSplit(12_345, { percentBasisPoints: 1250, minimumCents: 0 });
		expect(split.feeCents).toBe(1543);
		expect(split.gstOnFeeCents).toBe(140);
		expect(split.payoutCents + split.feeCents).toBe(12_345);
	});

	it('never takes more than the total', () => {
		expect(releaseSplit(1000, { percentBasisPoints: 1000, minimumCents: 1500 }).feeCents).toBe(
			1000
		);
		expect(releaseSplit(1000, { percentBasisPoints: 1000, minimumCents: 1500 }).payoutCents).toBe(
			0
		);
	});

	it('refuses fractions of a cent and empty totals', () => {
		expect(() => releaseSplit(10.5)).toThrow(RangeError);
		expect(() => releaseSplit(0)).toThrow(RangeError);
	});
});

describe('feeSettingsFrom', () => {
	it('reads a percentage and a minimum, and falls back on nonsense', () => {
		expect(feeSettingsFrom('12.5', '2000')).toEqual({
			percentBasisPoints: 1250,
			minimumCents: 2000
		});
		expect(feeSettingsFrom('lots', '-1')).toEqual({ percentBasisPoints: 1000, minimumCents: 1500 });
		expect(feeSettingsFrom(undefined, undefined)).toEqual({
			percentBasisPoints: 1000,
			minimumCents: 1500
		});
	});
});

describe('feeRuleText', () => {
	it('says the rule as the settings page sets it (Tapline’s default: 10 %, at least $15)', () => {
		expect(feeRuleText(DEFAULT_FEE)).toBe('10 % of the total, at least $15.00');
		expect(feeRuleText({ percentBasisPoints: 950, minimumCents: 1234 })).toBe(
			'9.5 % of the total, at least $12.34'
		);
	});
});

import { describe, expect, it } from 'vitest';
import { addGst, divideRoundHalfUp, formatAud, gstFromInclusive, scaleCents } from './money';

describe('gstFromInclusive', () => {
	it('takes one eleventh of a GST-inclusive price', () => {
		// Source: Australian Taxation Office — GST in a GST-inclusive price is 1/11 of it.
		expect(gstFromInclusive(11_000)).toBe(1_000); // $110.00 inclusive -> $10.00 GST
		// Source: ATO 1/11 rule; 9999 / 11 = 909 exactly, so no rounding is involved.
		expect(gstFromInclusive(9_999)).toBe(909); // $99.99 -> $9.09
	});

	it('rounds half up to the cent (our stated rule)', () => {
		// Source: ATO 1/11 rule; 10000 / 11 = 909.09... rounds down to 909.
		expect(gstFromInclusive(10_000)).toBe(909);
		// Source: ATO 1/11 rule; 6 / 11 = 0.545... rounds up to 1, 5 / 11 = 0.4545... down to 0.
		expect(gstFromInclusive(6)).toBe(1);
		expect(gstFromInclusive(5)).toBe(0);
		// Source: ATO 1/11 rule; 2750 / 11 = 250 exactly.
		expect(gstFromInclusive(2_750)).toBe(250);
	});

	it('handles refunds symmetrically', () => {
		// Source: ATO 1/11 rule applied to a negative adjustment of $110.00.
		expect(gstFromInclusive(-11_000)).toBe(-1_000);
	});

	it('rejects fractional cents', () => {
		// Source: house rule — money is integer cents.
		expect(() => gstFromInclusive(10.5)).toThrow(RangeError);
		expect(() => gstFromInclusive(Number.NaN)).toThrow(RangeError);
	});
});

describe('addGst', () => {
	it('adds 10 % GST', () => {
		// Source: Australian Taxation Office — GST is 10 %; $100.00 + $10.00 = $110.00.
		expect(addGst(10_000)).toBe(11_000);
		// Source: ATO 10 % rate; $12.34 -> GST 123.4 cents rounds to 123, total 1357.
		expect(addGst(1_234)).toBe(1_357);
	});

	it('rounds an exact half cent of GST up', () => {
		// Source: ATO 10 % rate; 5 cents ex GST -> 0.5 cent GST, our rule rounds half up -> 6.
		expect(addGst(5)).toBe(6);
		// Source: ATO 10 % rate; 15 cents -> 1.5 cents -> 2, total 17.
		expect(addGst(15)).toBe(17);
	});

	it('agrees with the 1/11 rule when the GST is read back', () => {
		// Source: ATO 1/11 rule; for any exclusive amount, GST added then extracted matches.
		for (const exclusive of [1, 5, 15, 99, 1_234, 45_678, 1_000_001]) {
			const inclusive = addGst(exclusive);
			expect(gstFromInclusive(inclusive)).toBe(inclusive - exclusive);
		}
	});

	it('rejects non-integers and bad rates', () => {
		// Source: house rule — money is integer cents.
		expect(() => addGst(0.1)).toThrow(RangeError);
		expect(() => addGst(100, -1)).toThrow(RangeError);
	});
});

describe('formatAud', () => {
	it('formats dollars with thousands separators and two decimals', () => {
		// Source: Australian dollar convention, en-AU style ($, comma groups, two decimals).
		expect(formatAud(123_450)).toBe('$1,234.50');
		expect(formatAud(0)).toBe('$0.00');
		expect(formatAud(5)).toBe('$0.05');
		expect(formatAud(100_000_000)).toBe('$1,000,000.00');
		expect(formatAud(99_999)).toBe('$999.99');
	});

	it('puts the minus sign before the dollar sign', () => {
		// Source: en-AU convention as produced by Intl.NumberFormat('en-AU', currency AUD).
		expect(formatAud(-123_450)).toBe('-$1,234.50');
		expect(formatAud(-123_450)).toBe(
			new Intl.NumberFormat('en-AU', { style: 'currency', currency: 'AUD' }).format(-1234.5)
		);
	});

	it('rejects fractional cents', () => {
		// Source: house rule — money is integer cents.
		expect(() => formatAud(1.5)).toThrow(RangeError);
	});
});

describe('rounding helpers', () => {
	it('rounds labour cost half up to whole cents', () => {
		// Source: our stated rule. 9999 c/h x 10 min / 60 = 1666.5 -> 1667.
		expect(scaleCents(9_999, 10, 60)).toBe(1_667);
		// 11000 c/h x 45 min / 60 = 8250 exactly.
		expect(scaleCents(11_000, 45, 60)).toBe(8_250);
		// 10001 c/h x 1 min / 60 = 166.68... -> 167.
		expect(scaleCents(10_001, 1, 60)).toBe(167);
	});

	it('rounds half away from zero for negatives', () => {
		// Source: our stated rule (half away from zero).
		expect(divideRoundHalfUp(-3, 2)).toBe(-2);
		expect(divideRoundHalfUp(3, 2)).toBe(2);
		expect(divideRoundHalfUp(-1, 3)).toBe(0);
	});
});

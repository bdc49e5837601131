import { describe, expect, it } from 'vitest';
import {
	ABN_CHECK_MESSAGE,
	ABN_FORMAT_MESSAGE,
	ABN_LEADING_ZERO_MESSAGE,
	ABN_ZERO_BODY_MESSAGE,
	abnProblem,
	abnSchema,
	formatAbn,
	isValidAbn,
	normaliseAbn
} from './abn';

// The check: Australian Business Register, "ABN format" — subtract 1 from the first digit,
// weight the digits 10, 1, 3, 5, 7, 9, 11, 13, 15, 17, 19, valid when the sum divides by 89.
// 51 824 753 556: the example usually quoted for that guidance (from memory, not re-checked
// against the register's page); it passes the check, worked by hand:
//   digits      5  1  8  2  4  7  5  3  5  5  6   -> first digit less 1: 4
//   weights    10  1  3  5  7  9 11 13 15 17 19
//   products   40  1 24 10 28 63 55 39 75 85 114
//   sum = 40 + 1 + 24 + 10 + 28 + 63 + 55 + 39 + 75 + 85 + 114 = 534 = 6 x 89
const EXAMPLE_ABN = '51824753556';

describe('isValidAbn', () => {
	it('accepts the register example, with or without spaces', () => {
		expect(isValidAbn(EXAMPLE_ABN)).toBe(true);
		expect(isValidAbn('51 824 753 556')).toBe(true);
		expect(isValidAbn(' 518 247 535 56 ')).toBe(true);
	});

	it('refuses every single-digit change of the example', () => {
		// Changing digit i by d changes the sum by weight_i x d. 89 is prime and larger than any
		// weight (≤ 19) or d (≤ 9), so no single change keeps the sum divisible: worked by hand.
		let changes = 0;
		for (let position = 0; position < EXAMPLE_ABN.length; position++) {
			for (let digit = 0; digit <= 9; digit++) {
				if (String(digit) === EXAMPLE_ABN[position]) continue;
				const changed =
					EXAMPLE_ABN.slice(0, position) + String(digit) + EXAMPLE_ABN.slice(position + 1);
				expect(isValidAbn(changed), changed).toBe(false);
				changes++;
			}
		}
		expect(changes).toBe(99);
	});

	it('refuses a swap of two neighbouring digits', () => {
		// 51 824 753 556 with the 2nd and 3rd digits swapped: 58 124 753 556.
		// Sum changes by (8 − 1) x 1 + (1 − 8) x 3 = −14 -> 520 = 5 x 89 + 75, not a multiple of
		// 89: worked by hand.
		expect(isValidAbn('58124753556')).toBe(false);
	});

	it('refuses wrong lengths and letters', () => {
		expect(isValidAbn('5182475355')).toBe(false);
		expect(isValidAbn('518247535560')).toBe(false);
		expect(isValidAbn('')).toBe(false);
		expect(isValidAbn('51 824 753 55O')).toBe(false);
		expect(isValidAbn('51-824-753-556')).toBe(false);
	});
});

describe('published valid and invalid examples', () => {
	// Only the numbers, as the check's worked examples; no entity is named or looked up.
	it.each([
		// Source: the 'ABN' package's README on PyPI (0.2), the example of a valid ABN.
		['51 824 753 556'],
		// Source: the 'ABN' package's README on PyPI (0.3.5): valid, and the ABN of ACN 004 085 616.
		['53 004 085 616'],
		// Source: python-stdnum's au.abn module and its TypeScript port 'stdnum' (au/abn.spec.ts).
		['83 914 571 673'],
		// Source: Oracle Fusion Cloud Financials, tax registration validation for Australia
		// ("Good" examples under the modulus 89 check).
		['11 223 491 505'],
		['20 561 300 000'],
		['31 010 111 200'],
		['90 000 100 000'],
		['60 231 941 111'],
		['65 118 220 001']
	])('%s passes', (abn) => {
		expect(isValidAbn(abn)).toBe(true);
		expect(abnProblem(abn)).toBeNull();
	});

	it('refuses the published invalid examples', () => {
		// Source: Oracle Fusion Cloud Financials, the "Bad" example (remainder not zero).
		expect(abnProblem('11223493504')).toBe(ABN_CHECK_MESSAGE);
		// Source: the 'ABN' package's README on PyPI and python-stdnum: 99 999 999 999 is invalid.
		expect(isValidAbn('99 999 999 999')).toBe(false);
	});
});

describe('numbers that pass the arithmetic but are no ABN', () => {
	it('refuses a leading 0', () => {
		// Source: ABR "ABN format" — the two leading digits are check digits (10 to 99). Worked by
		// hand: 01 300 000 000 -> (0 − 1) x 10 + 1 x 1 + 3 x 3 = 0, divisible by 89, so the
		// arithmetic alone would pass it.
		expect(abnProblem('01 300 000 000')).toBe(ABN_LEADING_ZERO_MESSAGE);
		expect(isValidAbn('01300000000')).toBe(false);
	});

	it('refuses nine zeros after the check digits', () => {
		// Source: from memory — the nine digits identify the entity and are never all zero.
		// Worked by hand: 10 000 000 000 -> (1 − 1) x 10 = 0, divisible by 89.
		expect(abnProblem('10 000 000 000')).toBe(ABN_ZERO_BODY_MESSAGE);
		expect(abnSchema.safeParse('10 000 000 000').error?.issues.map((i) => i.message)).toEqual([
			ABN_ZERO_BODY_MESSAGE
		]);
		// One non-zero identifying digit is a real body again: 90 000 100 000 (Oracle's example).
		expect(isValidAbn('90 000 100 000')).toBe(true);
	});
});

describe('normaliseAbn and formatAbn', () => {
	it('strips spaces and groups as 2-3-3-3', () => {
		expect(normaliseAbn(' 51 824\t753 556 ')).toBe(EXAMPLE_ABN);
		expect(formatAbn(EXAMPLE_ABN)).toBe('51 824 753 556');
		expect(formatAbn('5182 4753 556')).toBe('51 824 753 556');
		expect(() => formatAbn('1234')).toThrow(RangeError);
	});
});

describe('abnSchema', () => {
	it('outputs the bare digits of a valid ABN', () => {
		expect(abnSchema.parse('51 824 753 556')).toBe(EXAMPLE_ABN);
	});

	it('explains a failed check and a wrong format', () => {
		const failedCheck = abnSchema.safeParse('51 824 753 557');
		expect(failedCheck.success).toBe(false);
		expect(failedCheck.error?.issues.map((issue) => issue.message)).toEqual([ABN_CHECK_MESSAGE]);
		expect(ABN_CHECK_MESSAGE).toBe(
			'That ABN does not pass the ABN check: please check the 11 digits'
		);
		const letters = abnSchema.safeParse('ABN 51 824 753 556');
		expect(letters.success).toBe(false);
		expect(letters.error?.issues.map((issue) => issue.message)).toEqual([ABN_FORMAT_MESSAGE]);
	});
});

import { describe, expect, it } from 'vitest';
import {
	ABN_CHECK_MESSAGE,
	ABN_FORMAT_MESSAGE,
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

/**
 * Australian Business Number helpers. Installers give an ABN when they apply; the check digit
 * test catches typos before anyone looks the number up in the register.
 */
import { z } from 'zod';
import { textField } from '$lib/forms/fields';

/**
 * Weights of the 11 digits in the ABN check (Australian Business Register, "ABN format").
 */
export const ABN_WEIGHTS = [10, 1, 3, 5, 7, 9, 11, 13, 15, 17, 19] as const;

/** Shown when an ABN has 11 digits but fails the check. */
export const ABN_CHECK_MESSAGE = 'That ABN does not pass the ABN check: please check the 11 digits';

/** Shown when the input is not 11 digits at all. */
export const ABN_FORMAT_MESSAGE = 'An ABN is 11 digits, for example 51 824 753 556';

/** Shown for an ABN that starts with 0: real ABNs never do (their check digits are 10 to 99). */
export const ABN_LEADING_ZERO_MESSAGE = 'An ABN never starts with 0: please check the first digit';

/** Shown for an ABN whose nine identifying digits are all zeros: no entity has that number. */
export const ABN_ZERO_BODY_MESSAGE =
	'The last nine digits of an ABN are never all zeros: please check the number';

/**
 * Removes the spaces people type or paste into an ABN ('51 824 753 556' -> '51824753556').
 * Other characters are kept so that validation can refuse them.
 * @param input the ABN as entered
 */
export function normaliseAbn(input: string): string {
	return input.replace(/\s+/g, '');
}

/**
 * Whether an ABN passes the Australian Business Register check: subtract 1 from the first
 * digit, multiply each digit by its weight (10, 1, 3, 5, … 19), add them up; the ABN is valid
 * when the sum divides by 89. Numbers starting with 0 or with nine zeros after the check digits
 * are refused too (see {@link abnProblem}).
 * @param input the ABN, spaces allowed
 */
export function isValidAbn(input: string): boolean {
	return abnProblem(input) === null;
}

/**
 * Why an ABN is not valid, in words for the person typing it, or null when it is. Beyond the
 * register's check: the two leading check digits run from 10 to 99, so an ABN never starts with
 * 0, and the nine identifying digits after them are never all zeros (10 000 000 000 passes the
 * arithmetic all the same).
 * @param input the ABN, spaces allowed
 */
export function abnProblem(input: string): string | null {
	const abn = normaliseAbn(input);
	if (!/^\d{11}$/.test(abn)) return ABN_FORMAT_MESSAGE;
	if (abn.startsWith('0')) return ABN_LEADING_ZERO_MESSAGE;
	if (/^\d{2}0{9}$/.test(abn)) return ABN_ZERO_BODY_MESSAGE;
	return passesCheck(abn) ? null : ABN_CHECK_MESSAGE;
}

function passesCheck(abn: string): boolean {
	const digits = [...abn].map(Number);
	digits[0] = (digits[0] ?? 0) - 1;
	const sum = digits.reduce((total, digit, index) => total + digit * (ABN_WEIGHTS[index] ?? 0), 0);
	return sum % 89 === 0;
}

/**
 * Formats an ABN the way the register prints it: 'NN NNN NNN NNN'.
 * @param input the ABN, spaces allowed
 * @throws RangeError unless the input is 11 digits
 */
export function formatAbn(input: string): string {
	const abn = normaliseAbn(input);
	if (!/^\d{11}$/.test(abn)) throw new RangeError(ABN_FORMAT_MESSAGE);
	return `${abn.slice(0, 2)} ${abn.slice(2, 5)} ${abn.slice(5, 8)} ${abn.slice(8)}`;
}

/** Form field for an ABN: accepts spaces, outputs the 11 digits without them. */
export const abnSchema = textField()
	.transform(normaliseAbn)
	.pipe(
		z
			.string()
			// abort: a wrong length or a letter is the one message worth showing.
			.regex(/^\d{11}$/, { message: ABN_FORMAT_MESSAGE, abort: true })
			.superRefine((abn, ctx) => {
				const problem = abnProblem(abn);
				if (problem) ctx.addIssue({ code: 'custom', message: problem });
			})
	);

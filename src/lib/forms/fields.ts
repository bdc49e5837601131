/**
 * Field building blocks for every form schema, so bad input is refused with a message a person
 * understands instead of reaching PostgreSQL and failing there (a 500): free text goes through
 * `textField`, dates are checked against the calendar, not a digits pattern.
 */
import { z } from 'zod';

/** Shown when a field holds a NUL character, which PostgreSQL cannot store in text or jsonb. */
export const NUL_MESSAGE = 'Remove the hidden control character (NUL) from this text.';

/** True when the text holds no NUL (U+0000). */
export const hasNoNul = (value: string) => !value.includes('\u0000');

/**
 * `z.string()` that refuses NUL characters before any other check; chain `.trim()`, `.min()`,
 * `.max()` as usual. Use it for every string a form or query posts.
 */
export function textField(params?: Parameters<typeof z.string>[0]) {
	return z.string(params).refine(hasNoNul, { error: NUL_MESSAGE, abort: true });
}

/** True for a `YYYY-MM-DD` date that exists (no 30 February; 29 February only in leap years). */
export const isCalendarDate = (value: string) => z.iso.date().safeParse(value).success;

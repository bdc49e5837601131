/**
 * The dispute forms: the owner raising a problem, either side adding to the timeline, and an
 * admin's note and settlement. Photos come through the upload pipeline, not these schemas.
 */
import { z } from 'zod';
import { DISPUTE_REASONS, SETTLEMENT_OUTCOMES } from '$lib/work/disputes';
import { isCalendarDate, textField } from './fields';

/** At most this many photos with one entry (Tapline's choice: enough to show a fault). */
export const MAX_DISPUTE_PHOTOS = 6;

const words = (min: number, max: number, what: string) =>
	textField({ error: `Write ${what}` })
		.trim()
		.min(min, { error: `Write ${what} (at least ${String(min)} characters)` })
		.max(max, { error: `Keep it under ${String(max)} characters` });

export const raiseProblemSchema = z.object({
	reason: z.enum(DISPUTE_REASONS, { error: 'Choose what is wrong' }),
	description: words(10, 2000, 'what is wrong, in a few sentences')
});

export const disputeEntrySchema = z.object({
	body: words(5, 2000, 'your side, in a few sentences')
});

export const adminNoteSchema = z.object({
	body: words(5, 1000, 'the note')
});

/** Dollars and cents as typed ('150' or '150.50') to whole cents; null when not a sum of money. */
export function dollarsToCents(typed: string): number | null {
	const m = /^\$?\s*(\d{1,7})(?:\.(\d{1,2}))?$/.exec(typed.trim());
	if (!m) return null;
	return Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
}

export const settleSchema = z
	.object({
		outcome: z.enum(SETTLEMENT_OUTCOMES, { error: 'Choose how to settle' }),
		refund: textField().trim().max(20).default(''),
		visitDate: textField()
			.trim()
			.refine((v) => v === '' || isCalendarDate(v), {
				message: 'Choose a day that exists on the calendar'
			})
			.default(''),
		visitTime: textField().trim().max(5).default(''),
		note: words(5, 1000, 'an explanation both sides will read'),
		// A default, not optional(): zod skips an optional field's refinement when the field is
		// missing, and a settlement posted without the tick went through.
		confirm: textField()
			.default('')
			.refine((v) => v === 'on' || v === 'true', { message: 'Tick the box to confirm' })
	})
	.superRefine((v, ctx) => {
		if (v.outcome === 'partial_refund' && dollarsToCents(v.refund) === null) {
			ctx.addIssue({
				code: 'custom',
				path: ['refund'],
				message: 'Enter the refund in dollars, e.g. 150 or 150.50'
			});
		}
		if (v.outcome === 'return_visit') {
			if (v.visitDate === '') {
				ctx.addIssue({ code: 'custom', path: ['visitDate'], message: 'Choose the day' });
			}
			if (!/^([01]\d|2[0-3]):[0-5]\d$/.test(v.visitTime)) {
				ctx.addIssue({ code: 'custom', path: ['visitTime'], message: 'Choose the start time' });
			}
		}
	});

/**
 * The installer's quote form: amounts in dollars and cents (GST included), up to three proposed
 * times as local date + start time sharing one length, an expiry date. Converted to cents and UTC
 * instants in the installer's zone by {@link toQuoteInput}; the business rules live in quotes.ts.
 */
import { z } from 'zod';
import { isCalendarDate, textField } from '$lib/forms/fields';
import { MAX_QUOTE_SLOTS } from '$lib/marketplace/pricing';
import { resolveSlotStart } from '$lib/work/schedule';
import { localToUtc } from '$lib/time';
import type { QuoteInput } from '$lib/server/marketplace/quotes';

const dollars = (what: string) =>
	z
		.number({ error: `Enter the ${what} in dollars` })
		.min(0, { error: `The ${what} cannot be negative` })
		.max(20_000, { error: `The ${what} is over $20,000; check for a typo` })
		.refine((v) => Math.abs(Math.round(v * 100) - v * 100) < 1e-6, {
			error: `Enter the ${what} in dollars and cents`
		});

const TIME = /^([01]\d|2[0-3]):[0-5]\d$/;

export const quoteFormSchema = z.object({
	labourDollars: dollars('labour'),
	partDollars: z.array(dollars('part price')).default([]),
	cameraSupplied: z.boolean().default(false),
	cameraDollars: dollars('camera price').default(0),
	warrantyMonths: z
		.number({ error: 'Enter the warranty in months' })
		.int({ error: 'Enter whole months' })
		.min(0, { error: 'Warranty cannot be negative' })
		.max(120, { error: 'At most 120 months' })
		.default(12),
	durationMinutes: z
		.number({ error: 'Choose how long the fit takes' })
		.int()
		.min(30, { error: 'At least 30 minutes' })
		.max(600, { error: 'At most 10 hours' })
		.default(120),
	slotDate: z
		.array(
			z
				.string()
				.refine((v) => v === '' || isCalendarDate(v), { error: 'Choose a date that exists' })
		)
		.max(MAX_QUOTE_SLOTS)
		.default(['', '', '']),
	slotTime: z
		.array(z.string().refine((v) => v === '' || TIME.test(v), { error: 'Choose a start time' }))
		.max(MAX_QUOTE_SLOTS)
		.default(['', '', '']),
	/** For a start time the clocks repeat (daylight saving ends): which of the two is meant. */
	slotRepeat: z
		.array(z.enum(['', 'earlier', 'later']))
		.max(MAX_QUOTE_SLOTS)
		.default(['', '', '']),
	message: textField()
		.trim()
		.max(1000, { error: 'Keep the message under 1,000 characters' })
		.default(''),
	expiresOn: z.iso.date({ error: 'Choose the last day the quote holds' })
});
export type QuoteForm = z.output<typeof quoteFormSchema>;

const addDay = (date: string) => {
	const [y, m, d] = date.split('-').map(Number) as [number, number, number];
	return new Date(Date.UTC(y, m - 1, d + 1)).toISOString().slice(0, 10);
};

/**
 * The form's values as quotes.ts takes them; the quote holds to the end of its expiry date. A
 * start time the clocks skipped, or repeated without saying which, comes back as a problem.
 */
export function toQuoteInput(
	form: QuoteForm,
	timeZone: string
): QuoteInput | { problems: string[] } {
	const problems: string[] = [];
	const slots = form.slotDate.flatMap((date, i) => {
		const time = form.slotTime[i] ?? '';
		if (!date || !time) return [];
		const resolved = resolveSlotStart(date, time, timeZone, form.slotRepeat[i] ?? '');
		if (!resolved.ok) {
			problems.push(`Time ${String(i + 1)}: ${resolved.problem}`);
			return [];
		}
		const start = resolved.start;
		return [{ start, end: new Date(start.getTime() + form.durationMinutes * 60_000) }];
	});
	if (problems.length > 0) return { problems };
	return {
		labourCents: Math.round(form.labourDollars * 100),
		partUnitCents: form.partDollars.map((d) => Math.round(d * 100)),
		cameraSupplied: form.cameraSupplied,
		cameraCents: form.cameraSupplied ? Math.round(form.cameraDollars * 100) : 0,
		warrantyMonths: form.warrantyMonths,
		slots,
		message: form.message || null,
		expiresAt: localToUtc(addDay(form.expiresOn), '00:00', timeZone)
	};
}

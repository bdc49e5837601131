import { describe, expect, it } from 'vitest';
import { quoteFormSchema, toQuoteInput } from './quote-form';

// Source for the clock changes: IANA tz database, 'australasia', Australia/Adelaide rule AS —
// daylight time ends Sun 5 April 2026 at 03:00 (back to 02:00) and starts Sun 4 October 2026 at
// 02:00 (forward to 03:00).
const ZONE = 'Australia/Adelaide';

const form = (slotDate: string[], slotTime: string[], slotRepeat?: string[]) =>
	quoteFormSchema.parse({
		labourDollars: 200,
		slotDate,
		slotTime,
		...(slotRepeat ? { slotRepeat } : {}),
		expiresOn: '2026-03-20'
	});

describe('toQuoteInput', () => {
	it('refuses a slot at a time the clocks skipped, saying what they did', () => {
		const result = toQuoteInput(form(['2026-10-04', '2026-10-05'], ['02:30', '09:00']), ZONE);
		expect(result).toEqual({
			problems: [
				'Time 1: On Sun 4 Oct 2026 the clocks in Australia/Adelaide went forward an hour at ' +
					'2:00 am (ACST) to 3:00 am (ACDT), so 2:30 am did not happen that day. Choose another time.'
			]
		});
	});

	it('asks which one for a repeated time and uses the one chosen', () => {
		const unchosen = toQuoteInput(form(['2026-04-05', '2026-04-06'], ['02:30', '09:00']), ZONE);
		expect('problems' in unchosen && unchosen.problems[0]).toContain('Say which one you mean.');
		const chosen = toQuoteInput(
			form(['2026-04-05', '2026-04-06'], ['02:30', '09:00'], ['later', '']),
			ZONE
		);
		if ('problems' in chosen) throw new Error(chosen.problems.join(' '));
		// 02:30 ACST = 17:00Z on the 4th; the fit's default 120 minutes end at 19:00Z.
		expect(chosen.slots[0]).toEqual({
			start: new Date('2026-04-04T17:00:00Z'),
			end: new Date('2026-04-04T19:00:00Z')
		});
		// 09:00 ACST on 6 April = 23:30Z on the 5th.
		expect(chosen.slots[1]?.start).toEqual(new Date('2026-04-05T23:30:00Z'));
	});
});

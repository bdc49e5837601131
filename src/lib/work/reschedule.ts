/**
 * Checking a proposed new time for a paid booking (pure: the server adds the installer's diary and
 * the exclusion constraint). A person gives a local date and start and end times in the booking's
 * zone; the answer is the slot as UTC instants or a message for each field at fault.
 */
import { resolveSlotStart, type Interval, type RepeatedTimeChoice } from './schedule';

/** A new time must start at least this long after it is proposed (Tapline's choice). */
export const MIN_NOTICE_HOURS = 2;
/** And no further ahead than this (Tapline's choice: the same horizon as a quote's slots). */
export const MAX_DAYS_AHEAD = 90;
/** A fit takes between half an hour and ten hours (common trade practice for a hard-wired fit). */
export const MIN_SLOT_MINUTES = 30;
export const MAX_SLOT_MINUTES = 10 * 60;

export interface ProposedTime {
	date: string;
	start: string;
	end: string;
	/** For a time the clocks repeat: which pass. */
	repeated?: RepeatedTimeChoice;
}

export type ProposedSlotCheck =
	| { ok: true; slot: Interval }
	| { ok: false; fields: Partial<Record<'date' | 'start' | 'end', string>> };

const MINUTE = 60_000;

/**
 * The slot a person meant, or why it cannot be proposed: a time the clocks skip or repeat
 * unanswered, an end not after the start, a fit shorter than 30 minutes or longer than 10 hours,
 * a start less than 2 hours away or more than 90 days ahead.
 * @param input local date 'YYYY-MM-DD' and times 'HH:mm' in `zone`
 * @param zone the booking's IANA zone
 * @param now the present
 */
export function checkProposedSlot(input: ProposedTime, zone: string, now: Date): ProposedSlotCheck {
	let start;
	let end;
	try {
		start = resolveSlotStart(input.date, input.start, zone, input.repeated ?? '');
		end = resolveSlotStart(input.date, input.end, zone, input.repeated ?? '');
	} catch {
		return { ok: false, fields: { date: 'Give a real calendar date.' } };
	}
	if (!start.ok) return { ok: false, fields: { start: start.problem } };
	if (!end.ok) return { ok: false, fields: { end: end.problem } };
	const minutes = (end.start.getTime() - start.start.getTime()) / MINUTE;
	if (minutes <= 0) return { ok: false, fields: { end: 'The end must be after the start.' } };
	if (minutes < MIN_SLOT_MINUTES) {
		return { ok: false, fields: { end: `Allow at least ${MIN_SLOT_MINUTES} minutes.` } };
	}
	if (minutes > MAX_SLOT_MINUTES) {
		return { ok: false, fields: { end: `A fit slot is at most ${MAX_SLOT_MINUTES / 60} hours.` } };
	}
	const ahead = start.start.getTime() - now.getTime();
	if (ahead < MIN_NOTICE_HOURS * 60 * MINUTE) {
		return {
			ok: false,
			fields: { start: `Choose a time at least ${MIN_NOTICE_HOURS} hours from now.` }
		};
	}
	if (ahead > MAX_DAYS_AHEAD * 24 * 60 * MINUTE) {
		return {
			ok: false,
			fields: { date: `Choose a date within ${MAX_DAYS_AHEAD} days.` }
		};
	}
	return { ok: true, slot: { start: start.start, end: end.start } };
}

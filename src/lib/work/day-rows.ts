/**
 * The installer's day as people read it: booked fits, quotes waiting for an answer and message
 * threads turned into rows of words (dates through $lib/time, money through $lib/money/money, statuses
 * through $lib/labels). Pure, so the pages and tests share it.
 */
import { BOOKING_STATUS_LABELS } from '../labels';
import type { FitStageName } from './lifecycle';
import { formatAud } from '../money/money';
import { formatDay, formatDayTime, formatDayTimeRange, formatInZone } from '../time';

/** How much of a message the lists show. */
export const SNIPPET_CHARACTERS = 120;

/** A fit as the day view, the fits page and the hours page list it. */
export interface FitRow {
	bookingId: string;
	jobId: string;
	title: string;
	suburb: string | null;
	when: string;
	/** The local date 'YYYY-MM-DD', so the hours page can warn against blocking it. */
	day: string;
	status: string;
	/** The fit report: due (paid, not yet fitted), filed (the record exists) or neither. */
	report: 'due' | 'filed' | null;
}

/** A booked slot in words, in the installer's zone. */
export function fitRow(
	fit: {
		bookingId: string;
		jobId: string;
		title: string;
		suburb: string | null;
		slotStart: Date;
		slotEnd: Date;
		status: 'awaiting_payment' | 'confirmed' | 'cancelled' | 'lapsed';
		stage?: FitStageName;
	},
	zone: string,
	now = new Date()
): FitRow {
	return {
		bookingId: fit.bookingId,
		jobId: fit.jobId,
		title: fit.title,
		suburb: fit.suburb,
		when: formatDayTimeRange(fit.slotStart, fit.slotEnd, zone, now),
		day: formatInZone(fit.slotStart, zone, 'yyyy-MM-dd'),
		status: BOOKING_STATUS_LABELS[fit.status],
		report:
			fit.status !== 'confirmed' || !fit.stage ? null : fit.stage === 'to_fit' ? 'due' : 'filed'
	};
}

/** A quote waiting for the owner, in words. */
export function waitingQuoteRow(
	q: {
		quoteId: string;
		jobId: string;
		title: string;
		suburb: string | null;
		totalCents: number;
		revision: number;
		sentAt: Date;
		expiresAt: Date | null;
	},
	zone: string,
	now = new Date()
) {
	return {
		quoteId: q.quoteId,
		jobId: q.jobId,
		title: q.title,
		suburb: q.suburb,
		total: formatAud(q.totalCents),
		revision: q.revision,
		sent: formatDay(q.sentAt, zone, now),
		// A quote holds to the end of its last day; expiresAt is the midnight after it.
		holdsUntil: q.expiresAt ? formatDay(new Date(q.expiresAt.getTime() - 1), zone, now) : null
	};
}

/** The start of a message, cut at a word near {@link SNIPPET_CHARACTERS}. */
export function snippet(body: string, max = SNIPPET_CHARACTERS): string {
	const text = body.replace(/\s+/g, ' ').trim();
	if (text.length <= max) return text;
	const cut = text.slice(0, max);
	const space = cut.lastIndexOf(' ');
	return `${(space > max / 2 ? cut.slice(0, space) : cut).trimEnd()}…`;
}

/** A thread in words: its job, when it last moved, its newest message's start. */
export function threadRow(
	t: { jobId: string; title: string; lastAt: Date; lastBody: string; ownerWroteLast: boolean },
	zone: string,
	now = new Date()
) {
	return {
		jobId: t.jobId,
		title: t.title,
		last: formatDayTime(t.lastAt, zone, now),
		snippet: snippet(t.lastBody),
		ownerWroteLast: t.ownerWroteLast
	};
}

/**
 * The page number a "see all" list was asked for: a positive whole number, else 1.
 * @param value the `page` query parameter
 */
export function pageNumber(value: string | null): number {
	const n = Number(value);
	return Number.isSafeInteger(n) && n > 0 && n <= 10_000 ? n : 1;
}

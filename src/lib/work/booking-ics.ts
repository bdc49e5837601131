/**
 * A booking as an iCalendar file (RFC 5545), made with the `ics` package. Times are written as
 * UTC instants (`DTSTART:…Z`), which every calendar shows in its own zone, so no VTIMEZONE is
 * needed and a slot across a daylight-saving change stays exact. The UID is fixed per booking and
 * SEQUENCE counts the times it was moved, so a calendar that imported the first file replaces the
 * event instead of adding a second one (RFC 5545 sections 3.8.4.7 and 3.8.7.4). A cancelled
 * booking's file is METHOD:CANCEL with STATUS:CANCELLED under the same UID and a raised SEQUENCE, so
 * a calendar that holds the event removes it (RFC 5546 section 3.2.5).
 */
import { createEvent } from 'ics';

export interface BookingCalendarEvent {
	bookingId: string;
	start: Date;
	end: Date;
	title: string;
	location: string;
	description: string;
	url: string;
	/** booking.calendarSequence: 0 for the booked time, one more per accepted new time. */
	sequence: number;
	/** The booking was cancelled after it was paid: the file takes the event out of calendars. */
	cancelled?: boolean;
}

/** RFC 5545 section 3.1: a content line is at most 75 octets, not counting the line break. */
const MAX_LINE_OCTETS = 75;
const utf8 = new TextEncoder();

/**
 * Folds one unfolded content line at 75 octets of UTF-8 (RFC 5545 section 3.1), never inside a
 * character: each continuation starts with a space, which counts towards its 75.
 */
export function foldContentLine(line: string): string {
	const parts: string[] = [];
	let current = '';
	let octets = 0;
	for (const char of line) {
		const size = utf8.encode(char).length;
		if (octets + size > MAX_LINE_OCTETS) {
			parts.push(current);
			current = ' ';
			octets = 1;
		}
		current += char;
		octets += size;
	}
	parts.push(current);
	return parts.join('\r\n');
}

/** Refolds a whole file: the `ics` package folds at 75 characters, which splits too late. */
function refold(text: string): string {
	const unfolded = text.replace(/\r\n[ \t]/g, '');
	return unfolded
		.split('\r\n')
		.map((line) => (line === '' ? line : foldContentLine(line)))
		.join('\r\n');
}

/** The UID of a booking's event: the same in every file for that booking. */
export const bookingEventUid = (bookingId: string) => `booking-${bookingId}@tapline`;

/**
 * The text of the booking's .ics file.
 * @throws when the `ics` package refuses the event (it validates every field)
 */
export function bookingCalendarFile(event: BookingCalendarEvent): string {
	const { error, value } = createEvent({
		productId: 'tapline/bookings',
		uid: bookingEventUid(event.bookingId),
		method: event.cancelled ? 'CANCEL' : 'PUBLISH',
		// A cancellation is a change to the event, so its SEQUENCE is one above the last file's.
		sequence: event.cancelled ? event.sequence + 1 : event.sequence,
		start: event.start.getTime(),
		startInputType: 'utc',
		startOutputType: 'utc',
		end: event.end.getTime(),
		endInputType: 'utc',
		endOutputType: 'utc',
		title: event.title,
		location: event.location,
		description: event.description,
		url: event.url,
		status: event.cancelled ? 'CANCELLED' : 'CONFIRMED',
		busyStatus: 'BUSY'
	});
	if (error || !value) throw error ?? new Error('The calendar file could not be made.');
	return refold(value);
}

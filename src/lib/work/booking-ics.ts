/**
 * A booking as an iCalendar file (RFC 5545), made with the `ics` package. Times are written as
 * UTC instants (`DTSTART:…Z`), which every calendar shows in its own zone, so no VTIMEZONE is
 * needed and a slot across a daylight-saving change stays exact. The UID is fixed per booking and
 * SEQUENCE counts the times it was moved, so a calendar that imported the first file replaces the
 * event instead of adding a second one (RFC 5545 sections 3.8.4.7 and 3.8.7.4).
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
	cancelled?: boolean;
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
		sequence: event.sequence,
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
	return value;
}

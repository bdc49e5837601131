import ICAL from 'ical.js';
import { describe, expect, it } from 'vitest';
import { bookingCalendarFile, bookingEventUid, foldContentLine } from './booking-ics';

// Read back with ical.js, a second iCalendar library (RFC 5545), not the one that wrote the file.
function read(text: string) {
	const vevent = new ICAL.Component(ICAL.parse(text)).getFirstSubcomponent('vevent');
	if (!vevent) throw new Error('no VEVENT');
	return { event: new ICAL.Event(vevent), status: vevent.getFirstPropertyValue('status') };
}

const EVENT = {
	bookingId: '0b7c4d0e-0000-4000-8000-000000000001',
	// Sat 3 Apr 2027 9:00 am ACDT (UTC+10:30, IANA tz Australia/Adelaide) = 22:30 UTC on the 2nd.
	start: new Date('2027-04-02T22:30:00Z'),
	end: new Date('2027-04-03T00:30:00Z'),
	title: 'Dash cam fit: front and rear, hatchback 2019',
	location: '1 Test Street, Norwood 5067',
	description: 'Booked on Tapline; fitting; wiring; notes.',
	url: 'http://127.0.0.1:3000/owner/bookings/x',
	sequence: 3
};

describe('bookingCalendarFile', () => {
	it('writes UTC instants, the stable UID, SEQUENCE and text with commas and semicolons intact', () => {
		const { event, status } = read(bookingCalendarFile(EVENT));
		expect(event.uid).toBe(bookingEventUid(EVENT.bookingId));
		expect(event.sequence).toBe(3);
		expect(event.startDate.toJSDate().toISOString()).toBe('2027-04-02T22:30:00.000Z');
		expect(event.endDate.toJSDate().toISOString()).toBe('2027-04-03T00:30:00.000Z');
		expect(event.summary).toBe(EVENT.title);
		expect(event.location).toBe(EVENT.location);
		expect(event.description).toBe(EVENT.description);
		expect(status).toBe('CONFIRMED');
	});

	it('marks a cancelled booking CANCELLED under the same UID', () => {
		const { event, status } = read(bookingCalendarFile({ ...EVENT, cancelled: true }));
		expect(status).toBe('CANCELLED');
		expect(event.uid).toBe(bookingEventUid(EVENT.bookingId));
	});
});

describe('bookingCalendarFile for a cancelled booking', () => {
	it('is METHOD:CANCEL, STATUS:CANCELLED, the same UID and SEQUENCE one above the last file', () => {
		const text = bookingCalendarFile({ ...EVENT, cancelled: true });
		const calendar = new ICAL.Component(ICAL.parse(text));
		expect(calendar.getFirstPropertyValue('method')).toBe('CANCEL');
		const { event, status } = read(text);
		expect(status).toBe('CANCELLED');
		expect(event.uid).toBe(bookingEventUid(EVENT.bookingId));
		expect(event.sequence).toBe(EVENT.sequence + 1);
	});
});

describe('line folding', () => {
	// RFC 5545 section 3.1: content lines are at most 75 octets (UTF-8), excluding the CRLF.
	const encoder = new TextEncoder();
	const longText = 'Fahrzeug Ü: câble sous le tableau, fusible à côté — été. '.repeat(6);

	it('keeps every line within 75 octets even with non-ASCII text', () => {
		const text = bookingCalendarFile({ ...EVENT, description: longText, location: longText });
		for (const line of text.split('\r\n')) {
			expect(encoder.encode(line).length).toBeLessThanOrEqual(75);
		}
	});

	it('reads back the exact text through an independent parser', () => {
		const { event } = read(bookingCalendarFile({ ...EVENT, description: longText }));
		expect(event.description).toBe(longText);
	});

	it('never splits a multi-byte character', () => {
		const folded = foldContentLine('DESCRIPTION:' + 'é'.repeat(80));
		const lines = folded.split('\r\n');
		expect(lines.length).toBeGreaterThan(1);
		for (const line of lines) expect(line).not.toContain('\uFFFD');
		expect(folded.replace(/\r\n /g, '')).toBe('DESCRIPTION:' + 'é'.repeat(80));
	});
});

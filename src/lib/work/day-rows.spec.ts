import { describe, expect, it } from 'vitest';
import { fitRow, pageNumber, snippet, threadRow, waitingQuoteRow } from './day-rows';

// Source: IANA tz 'australasia', Adelaide is UTC+10:30 in December (daylight time).
const ZONE = 'Australia/Adelaide';
const NOW = new Date('2026-12-02T00:00:00Z');

describe('day rows', () => {
	it('writes a booked slot in the one date style, its local day and its status label', () => {
		const row = fitRow(
			{
				bookingId: 'b',
				jobId: 'j',
				title: '2018 Demo Hatch',
				suburb: 'Walkerville',
				slotStart: new Date('2026-12-07T22:30:00Z'),
				slotEnd: new Date('2026-12-08T00:30:00Z'),
				status: 'awaiting_payment'
			},
			ZONE,
			NOW
		);
		expect(row.when).toBe('Tue 8 Dec, 9:00 am – 11:00 am');
		// 22:30 UTC on the 7th is already the 8th in Adelaide.
		expect(row.day).toBe('2026-12-08');
		expect(row.status).toBe('Provisional: waiting for payment');
		expect(row.report).toBeNull();
	});

	it('says whether the fit report is due or filed for a paid booking', () => {
		const fit = {
			bookingId: 'b',
			jobId: 'j',
			title: 'T',
			suburb: null,
			slotStart: new Date('2026-12-07T22:30:00Z'),
			slotEnd: new Date('2026-12-08T00:30:00Z'),
			status: 'confirmed' as const
		};
		expect(fitRow({ ...fit, stage: 'to_fit' }, ZONE, NOW).report).toBe('due');
		expect(fitRow({ ...fit, stage: 'reported' }, ZONE, NOW).report).toBe('filed');
		expect(fitRow({ ...fit, status: 'cancelled', stage: 'to_fit' }, ZONE, NOW).report).toBeNull();
	});

	it('gives a quote its total in dollars and the last day it holds', () => {
		const row = waitingQuoteRow(
			{
				quoteId: 'q',
				jobId: 'j',
				title: 'T',
				suburb: null,
				totalCents: 23_050,
				revision: 2,
				sentAt: new Date('2026-12-01T01:00:00Z'),
				// Midnight after Tue 15 Dec in Adelaide.
				expiresAt: new Date('2026-12-15T13:30:00Z')
			},
			ZONE,
			NOW
		);
		expect(row.total).toBe('$230.50');
		expect(row.sent).toBe('Tue 1 Dec');
		expect(row.holdsUntil).toBe('Tue 15 Dec');
	});

	it('cuts a long message at a word and keeps a short one whole', () => {
		expect(snippet('  Is the car\n garaged? ')).toBe('Is the car garaged?');
		const long = 'word '.repeat(60);
		const cut = snippet(long, 22);
		expect(cut).toBe('word word word word…');
		expect(cut.length).toBeLessThanOrEqual(23);
	});

	it('says when a thread last moved and who owes an answer', () => {
		const row = threadRow(
			{
				jobId: 'j',
				title: 'T',
				lastAt: new Date('2026-12-07T20:00:00Z'),
				lastBody: 'Yes, it lives in a carport.',
				ownerWroteLast: true
			},
			ZONE,
			NOW
		);
		expect(row.last).toBe('Tue 8 Dec, 6:30 am');
		expect(row.ownerWroteLast).toBe(true);
	});

	it('reads a page number, falling back to the first page', () => {
		expect(pageNumber('3')).toBe(3);
		for (const bad of [null, '', '0', '-2', '1.5', 'abc', '99999999']) {
			expect(pageNumber(bad)).toBe(1);
		}
	});
});

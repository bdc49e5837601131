import { describe, expect, it } from 'vitest';
import { checkProposedSlot } from './reschedule';

// Offsets: IANA tz database, 'australasia', zone Australia/Adelaide, rule AS — UTC+9:30 standard,
// UTC+10:30 daylight time from the first Sunday of October 02:00 to the first Sunday of April
// 03:00 local. 2027: ends Sunday 4 April, starts Sunday 3 October.
const ZONE = 'Australia/Adelaide';
const NOW = new Date('2027-03-01T00:00:00Z');

describe('checkProposedSlot', () => {
	it('reads a local date and times as UTC instants (daylight time, UTC+10:30)', () => {
		const check = checkProposedSlot(
			{ date: '2027-03-10', start: '09:00', end: '11:30' },
			ZONE,
			NOW
		);
		expect(check).toEqual({
			ok: true,
			slot: { start: new Date('2027-03-09T22:30:00Z'), end: new Date('2027-03-10T01:00:00Z') }
		});
	});

	it('uses standard time (UTC+9:30) after the April change', () => {
		const check = checkProposedSlot(
			{ date: '2027-04-05', start: '09:00', end: '10:00' },
			ZONE,
			NOW
		);
		expect(check.ok && check.slot.start.toISOString()).toBe('2027-04-04T23:30:00.000Z');
	});

	it('refuses an end not after the start, too short and too long slots', () => {
		const at = (start: string, end: string) =>
			checkProposedSlot({ date: '2027-03-10', start, end }, ZONE, NOW);
		expect(at('10:00', '09:00')).toEqual({
			ok: false,
			fields: { end: 'The end must be after the start.' }
		});
		expect(at('10:00', '10:15')).toMatchObject({ ok: false, fields: { end: expect.any(String) } });
		expect(at('06:00', '17:00')).toMatchObject({ ok: false, fields: { end: expect.any(String) } });
		expect(at('06:00', '16:00').ok).toBe(true);
	});

	it('refuses a start in the past or under two hours away, and beyond 90 days', () => {
		const soon = checkProposedSlot(
			{ date: '2027-03-01', start: '11:00', end: '12:00' },
			ZONE,
			NOW // 10:30 am local
		);
		expect(soon).toMatchObject({
			ok: false,
			fields: { start: expect.stringContaining('2 hours') }
		});
		const past = checkProposedSlot({ date: '2027-02-20', start: '09:00', end: '10:00' }, ZONE, NOW);
		expect(past.ok).toBe(false);
		const far = checkProposedSlot({ date: '2027-06-01', start: '09:00', end: '10:00' }, ZONE, NOW);
		expect(far).toMatchObject({ ok: false, fields: { date: expect.stringContaining('90 days') } });
	});

	it('refuses a time the clocks skip and asks which pass of a repeated one', () => {
		const october = new Date('2027-09-20T00:00:00Z');
		const skipped = checkProposedSlot(
			{ date: '2027-10-03', start: '02:30', end: '04:00' },
			ZONE,
			october
		);
		expect(skipped).toMatchObject({ ok: false, fields: { start: expect.any(String) } });
		const repeated = checkProposedSlot(
			{ date: '2027-04-04', start: '02:30', end: '04:00' },
			ZONE,
			NOW
		);
		expect(repeated).toMatchObject({ ok: false, fields: { start: expect.any(String) } });
		const chosen = checkProposedSlot(
			{ date: '2027-04-04', start: '02:30', end: '04:00', repeated: 'later' },
			ZONE,
			NOW
		);
		// The second 2:30 am is standard time: 2:30 − 9:30 = 17:00 UTC the day before.
		expect(chosen.ok && chosen.slot.start.toISOString()).toBe('2027-04-03T17:00:00.000Z');
	});

	it('refuses a date that is not on the calendar', () => {
		const check = checkProposedSlot(
			{ date: '2027-02-30', start: '09:00', end: '10:00' },
			ZONE,
			NOW
		);
		expect(check).toEqual({ ok: false, fields: { date: 'Give a real calendar date.' } });
	});
});

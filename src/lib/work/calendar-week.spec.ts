import { describe, expect, it } from 'vitest';
import { addCalendarDays, buildWeek, mondayOf, weekFromParam } from './calendar-week';

// Offsets: IANA tz database, zone Australia/Adelaide (UTC+10:30 daylight time from the first
// Sunday of October to the first Sunday of April, UTC+9:30 otherwise). Weekdays checked with
// Date.getUTCDay: 2027-04-05 and 2026-12-07 are Mondays.
const ZONE = 'Australia/Adelaide';
const NOW = new Date('2026-12-02T02:00:00Z'); // Wed 2 Dec 2026, 12:30 pm in Adelaide

describe('week arithmetic', () => {
	it('finds the Monday of a week, across months and years', () => {
		expect(mondayOf('2026-12-02')).toBe('2026-11-30');
		expect(mondayOf('2026-11-30')).toBe('2026-11-30');
		expect(mondayOf('2027-01-03')).toBe('2026-12-28'); // a Sunday
		expect(addCalendarDays('2026-12-28', 7)).toBe('2027-01-04');
	});

	it('reads ?week= and falls back to this week for anything else', () => {
		expect(weekFromParam('2027-04-07', NOW, ZONE)).toBe('2027-04-05');
		expect(weekFromParam(null, NOW, ZONE)).toBe('2026-11-30');
		expect(weekFromParam('2027-02-30', NOW, ZONE)).toBe('2026-11-30');
		expect(weekFromParam('next', NOW, ZONE)).toBe('2026-11-30');
	});

	it("takes this week from the installer's zone, not UTC", () => {
		// Sunday 6 Dec 2026, 14:00 UTC is already Monday 7 Dec, 12:30 am in Adelaide.
		expect(weekFromParam(null, new Date('2026-12-06T14:00:00Z'), ZONE)).toBe('2026-12-07');
	});
});

describe('buildWeek', () => {
	const week = buildWeek({
		monday: '2027-03-29',
		hours: [
			{ weekday: 1, start: '13:00', end: '17:00' },
			{ weekday: 1, start: '08:00', end: '12:00' },
			{ weekday: 6, start: '09:00', end: '12:00' }
		],
		blocked: ['2027-04-02'],
		bookings: [
			{
				id: 'b2',
				jobId: 'j2',
				// Mon 5 Apr 2027 is next week; Sun 4 Apr 2027 10:00 ACST (after the change) = 00:30 UTC.
				start: new Date('2027-04-04T00:30:00Z'),
				end: new Date('2027-04-04T02:30:00Z'),
				title: 'Front and rear cameras, hatchback 2019',
				suburb: 'Norwood',
				status: 'confirmed'
			},
			{
				id: 'b1',
				jobId: 'j1',
				// Mon 29 Mar 2027 9:00 am ACDT = Sun 28 Mar 22:30 UTC: Monday locally.
				start: new Date('2027-03-28T22:30:00Z'),
				end: new Date('2027-03-29T00:30:00Z'),
				title: 'Front camera, ute 2021',
				suburb: null,
				status: 'awaiting_payment'
			}
		],
		zone: ZONE,
		now: NOW
	});

	it('runs Monday to Sunday with each day’s hours in order', () => {
		expect(week.map((d) => d.date)).toEqual([
			'2027-03-29',
			'2027-03-30',
			'2027-03-31',
			'2027-04-01',
			'2027-04-02',
			'2027-04-03',
			'2027-04-04'
		]);
		expect(week[0]!.label).toBe('Monday 29 Mar 2027');
		expect(week[6]!.label).toBe('Sunday 4 Apr 2027');
		expect(week[0]!.hours).toEqual(['8:00 am – 12:00 pm', '1:00 pm – 5:00 pm']);
		expect(week[1]!.hours).toEqual([]);
		expect(week[5]!.hours).toEqual(['9:00 am – 12:00 pm']);
	});

	it('marks blocked days and places bookings on their local start day, in local time', () => {
		expect(week.filter((d) => d.blocked).map((d) => d.date)).toEqual(['2027-04-02']);
		expect(week[0]!.bookings).toMatchObject([{ id: 'b1', time: '9:00 am – 11:00 am' }]);
		expect(week[6]!.bookings).toMatchObject([{ id: 'b2', time: '10:00 am – 12:00 pm' }]);
		expect(week.slice(1, 6).every((d) => d.bookings.length === 0)).toBe(true);
	});

	it('marks today in the zone', () => {
		const thisWeek = buildWeek({
			monday: '2026-11-30',
			hours: [],
			blocked: [],
			bookings: [],
			zone: ZONE,
			now: NOW
		});
		expect(thisWeek.filter((d) => d.today).map((d) => d.date)).toEqual(['2026-12-02']);
	});
});

import { describe, expect, it } from 'vitest';
import {
	candidateSlots,
	formatSlotLabel,
	formatSlotStart,
	repeatedTimeChoiceOf,
	repeatedTimeOptions,
	resolveSlotStart,
	isFree,
	isWithinWorkingHours,
	overlaps,
	validateWeeklyHours,
	type Interval,
	type WeeklyHours
} from './schedule';
import { formatInZone } from '../time';

// Source for every offset below: IANA tz database, 'australasia' file, zone Australia/Adelaide,
// rule AS — UTC+9:30 standard, UTC+10:30 daylight time from the first Sunday of October 02:00
// to the first Sunday of April 03:00 local. 2026: ends Sunday 5 April, starts Sunday 4 October;
// 2027: ends Sunday 4 April. Weekdays of the dates used were checked with Date.getUTCDay.
const ZONE = 'Australia/Adelaide';

const interval = (start: string, end: string): Interval => ({
	start: new Date(start),
	end: new Date(end)
});
const local = (slots: Interval[]) => slots.map((slot) => formatInZone(slot.start, ZONE, 'HH:mm'));
const iso = (slots: Interval[]) => slots.map((slot) => slot.start.toISOString());

const MONDAY_NINE_TO_FIVE: WeeklyHours = [{ weekday: 1, start: '09:00', end: '17:00' }];

describe('isWithinWorkingHours', () => {
	it('maps Monday 09:00–17:00 to 23:30Z Sunday – 07:30Z Monday in winter (+9:30)', () => {
		// Monday 6 July 2026: 09:00 − 9:30 = 23:30Z on Sunday 5 July; 17:00 − 9:30 = 07:30Z.
		const wholeDay = interval('2026-07-05T23:30:00Z', '2026-07-06T07:30:00Z');
		expect(isWithinWorkingHours(wholeDay, MONDAY_NINE_TO_FIVE, [], ZONE)).toBe(true);
		const minuteEarly = interval('2026-07-05T23:29:00Z', '2026-07-06T00:29:00Z');
		expect(isWithinWorkingHours(minuteEarly, MONDAY_NINE_TO_FIVE, [], ZONE)).toBe(false);
		const minuteLate = interval('2026-07-06T06:31:00Z', '2026-07-06T07:31:00Z');
		expect(isWithinWorkingHours(minuteLate, MONDAY_NINE_TO_FIVE, [], ZONE)).toBe(false);
	});

	it('maps Monday 09:00–17:00 to 22:30Z Sunday – 06:30Z Monday in summer (+10:30)', () => {
		// Monday 12 January 2026: 09:00 − 10:30 = 22:30Z on Sunday 11 January; 17:00 → 06:30Z.
		const wholeDay = interval('2026-01-11T22:30:00Z', '2026-01-12T06:30:00Z');
		expect(isWithinWorkingHours(wholeDay, MONDAY_NINE_TO_FIVE, [], ZONE)).toBe(true);
		// The winter instants would run an hour past 17:00 local in summer.
		const winterInstants = interval('2026-01-11T23:30:00Z', '2026-01-12T07:30:00Z');
		expect(isWithinWorkingHours(winterInstants, MONDAY_NINE_TO_FIVE, [], ZONE)).toBe(false);
	});

	it('follows the April 2027 change back to standard time', () => {
		// Monday 29 March 2027 is still daylight time (+10:30): 09:00 = 22:30Z Sunday.
		const before = interval('2027-03-28T22:30:00Z', '2027-03-28T23:30:00Z');
		expect(isWithinWorkingHours(before, MONDAY_NINE_TO_FIVE, [], ZONE)).toBe(true);
		// Monday 5 April 2027, the day after daylight saving ends (+9:30): 09:00 = 23:30Z Sunday.
		const after = interval('2027-04-04T22:30:00Z', '2027-04-04T23:30:00Z');
		expect(isWithinWorkingHours(after, MONDAY_NINE_TO_FIVE, [], ZONE)).toBe(false);
		const afterShifted = interval('2027-04-04T23:30:00Z', '2027-04-05T00:30:00Z');
		expect(isWithinWorkingHours(afterShifted, MONDAY_NINE_TO_FIVE, [], ZONE)).toBe(true);
	});

	it('refuses blocked dates and slots that straddle a lunch break', () => {
		const monday = interval('2026-07-06T00:30:00Z', '2026-07-06T01:30:00Z'); // 10:00–11:00
		expect(isWithinWorkingHours(monday, MONDAY_NINE_TO_FIVE, ['2026-07-06'], ZONE)).toBe(false);
		expect(isWithinWorkingHours(monday, MONDAY_NINE_TO_FIVE, ['2026-07-07'], ZONE)).toBe(true);
		const split: WeeklyHours = [
			{ weekday: 1, start: '09:00', end: '12:00' },
			{ weekday: 1, start: '13:00', end: '17:00' }
		];
		// 11:30–13:30 local runs through lunch.
		const acrossLunch = interval('2026-07-06T02:00:00Z', '2026-07-06T04:00:00Z');
		expect(isWithinWorkingHours(acrossLunch, split, [], ZONE)).toBe(false);
		// 13:00–14:00 local fits the afternoon block.
		const afternoon = interval('2026-07-06T03:30:00Z', '2026-07-06T04:30:00Z');
		expect(isWithinWorkingHours(afternoon, split, [], ZONE)).toBe(true);
		expect(() =>
			isWithinWorkingHours(
				interval('2026-07-06T03:30:00Z', '2026-07-06T03:30:00Z'),
				split,
				[],
				ZONE
			)
		).toThrow(RangeError);
	});

	it('counts real time across the spring-forward gap', () => {
		const sunday: WeeklyHours = [{ weekday: 0, start: '01:00', end: '05:00' }];
		// Sunday 4 October 2026: 01:30 (+9:30) = 16:00Z; one real hour later is 03:30 (+10:30).
		const overGap = interval('2026-10-03T16:00:00Z', '2026-10-03T17:00:00Z');
		expect(isWithinWorkingHours(overGap, sunday, [], ZONE)).toBe(true);
		// 05:00 daylight time = 18:30Z, so a slot to 19:00Z runs past the end of the block.
		const pastEnd = interval('2026-10-03T18:00:00Z', '2026-10-03T19:00:00Z');
		expect(isWithinWorkingHours(pastEnd, sunday, [], ZONE)).toBe(false);
	});
});

describe('overlaps and isFree', () => {
	const booking = interval('2026-07-06T00:45:00Z', '2026-07-06T01:45:00Z');

	it('treats intervals as half-open', () => {
		expect(overlaps(booking, interval('2026-07-06T01:45:00Z', '2026-07-06T02:45:00Z'))).toBe(false);
		expect(overlaps(booking, interval('2026-07-05T23:45:00Z', '2026-07-06T00:45:00Z'))).toBe(false);
		expect(overlaps(booking, interval('2026-07-06T01:44:00Z', '2026-07-06T02:00:00Z'))).toBe(true);
		expect(overlaps(booking, interval('2026-07-06T01:00:00Z', '2026-07-06T01:10:00Z'))).toBe(true);
	});

	it('is free only when no booking overlaps', () => {
		const slot = interval('2026-07-06T01:00:00Z', '2026-07-06T02:00:00Z');
		expect(isFree(slot, [])).toBe(true);
		expect(isFree(slot, [booking])).toBe(false);
		expect(isFree(interval('2026-07-06T02:00:00Z', '2026-07-06T03:00:00Z'), [booking])).toBe(true);
	});
});

describe('candidateSlots', () => {
	it('lists 30-minute steps of a winter Monday as UTC instants', () => {
		const slots = candidateSlots({
			hours: MONDAY_NINE_TO_FIVE,
			blocked: [],
			bookings: [],
			timeZone: ZONE,
			from: new Date('2026-07-05T00:00:00Z'),
			days: 3,
			durationMinutes: 60
		});
		// 09:00 to 16:00 local starts in 30-minute steps: (16 − 9) x 2 + 1 = 15 slots.
		expect(slots).toHaveLength(15);
		expect(slots[0]?.start.toISOString()).toBe('2026-07-05T23:30:00.000Z');
		expect(slots.at(-1)?.end.toISOString()).toBe('2026-07-06T07:30:00.000Z');
	});

	it('skips the missing hour on Sunday 4 October 2026', () => {
		const slots = candidateSlots({
			hours: [{ weekday: 0, start: '01:00', end: '05:00' }],
			blocked: [],
			bookings: [],
			timeZone: ZONE,
			from: new Date('2026-10-03T14:00:00Z'), // 23:30 Saturday local
			days: 2,
			durationMinutes: 30
		});
		// 02:00–03:00 does not exist that night, so four wall-clock hours hold three real hours.
		expect(local(slots)).toEqual(['01:00', '01:30', '03:00', '03:30', '04:00', '04:30']);
		expect(iso(slots)).toEqual([
			'2026-10-03T15:30:00.000Z', // 01:00 + 9:30
			'2026-10-03T16:00:00.000Z',
			'2026-10-03T16:30:00.000Z', // 03:00 + 10:30
			'2026-10-03T17:00:00.000Z',
			'2026-10-03T17:30:00.000Z',
			'2026-10-03T18:00:00.000Z'
		]);
	});

	it('offers the repeated hour twice on Sunday 5 April 2026', () => {
		const slots = candidateSlots({
			hours: [{ weekday: 0, start: '01:00', end: '05:00' }],
			blocked: [],
			bookings: [],
			timeZone: ZONE,
			from: new Date('2026-04-04T00:00:00Z'),
			days: 2,
			durationMinutes: 30
		});
		// 01:00 (+10:30) = 14:30Z on 4 April to 05:00 (+9:30) = 19:30Z: five real hours.
		expect(slots).toHaveLength(10);
		expect(slots[0]?.start.toISOString()).toBe('2026-04-04T14:30:00.000Z');
		expect(local(slots)).toEqual([
			'01:00',
			'01:30',
			'02:00',
			'02:30',
			'02:00',
			'02:30',
			'03:00',
			'03:30',
			'04:00',
			'04:30'
		]);
	});

	it('leaves out blocked dates and slots before the search starts', () => {
		const base = {
			hours: MONDAY_NINE_TO_FIVE,
			bookings: [],
			timeZone: ZONE,
			days: 14,
			durationMinutes: 60
		};
		const blocked = candidateSlots({
			...base,
			blocked: ['2026-07-06'],
			from: new Date('2026-07-05T00:00:00Z')
		});
		// Two Mondays in the window (6 and 13 July); only the 13th remains.
		expect(blocked).toHaveLength(15);
		expect(formatInZone(blocked[0]!.start, ZONE, 'yyyy-MM-dd HH:mm')).toBe('2026-07-13 09:00');
		// From 14:10 local on Monday 6 July (04:40Z): first start is 14:30, last 16:00.
		const lateStart = candidateSlots({
			...base,
			blocked: [],
			days: 1,
			from: new Date('2026-07-06T04:40:00Z')
		});
		expect(local(lateStart)).toEqual(['14:30', '15:00', '15:30', '16:00']);
	});

	it('drops candidates that overlap a booking', () => {
		// Booking 10:15–11:15 local on Monday 6 July = 00:45Z–01:45Z.
		const booking = interval('2026-07-06T00:45:00Z', '2026-07-06T01:45:00Z');
		const slots = candidateSlots({
			hours: MONDAY_NINE_TO_FIVE,
			blocked: [],
			bookings: [booking],
			timeZone: ZONE,
			from: new Date('2026-07-05T00:00:00Z'),
			days: 2,
			durationMinutes: 60
		});
		// One-hour starts 09:30, 10:00, 10:30 and 11:00 overlap it; 09:00 ends at 10:00 and
		// 11:30 starts after 11:15, so 15 − 4 = 11 remain.
		expect(local(slots)).toEqual([
			'09:00',
			'11:30',
			'12:00',
			'12:30',
			'13:00',
			'13:30',
			'14:00',
			'14:30',
			'15:00',
			'15:30',
			'16:00'
		]);
		for (const slot of slots) expect(overlaps(slot, booking)).toBe(false);
	});

	it('refuses invalid hours and sizes', () => {
		const base = {
			blocked: [],
			bookings: [],
			timeZone: ZONE,
			from: new Date('2026-07-05T00:00:00Z'),
			days: 1
		};
		expect(() =>
			candidateSlots({ ...base, hours: MONDAY_NINE_TO_FIVE, durationMinutes: 0 })
		).toThrow(RangeError);
		expect(() =>
			candidateSlots({
				...base,
				hours: [{ weekday: 1, start: '17:00', end: '09:00' }],
				durationMinutes: 60
			})
		).toThrow(/finish must be after the start/);
	});
});

describe('validateWeeklyHours', () => {
	it('accepts a normal week with a lunch break', () => {
		expect(
			validateWeeklyHours([
				{ weekday: 1, start: '09:00', end: '12:00' },
				{ weekday: 1, start: '12:30', end: '17:00' },
				{ weekday: 2, start: '09:00', end: '17:00' }
			])
		).toEqual([]);
	});

	it('explains overlaps, back-to-front blocks and badly written times', () => {
		expect(
			validateWeeklyHours([
				{ weekday: 3, start: '09:00', end: '12:00' },
				{ weekday: 3, start: '11:00', end: '14:00' },
				{ weekday: 5, start: '17:00', end: '09:00' },
				{ weekday: 6, start: '9am', end: '24:00' }
			])
		).toEqual([
			'Friday 17:00–09:00: the finish must be after the start.',
			"Saturday: '9am' and '24:00' should be a 24-hour time like 09:00.",
			'Wednesday: 09:00–12:00 overlaps 11:00–14:00.'
		]);
	});
});

describe('resolveSlotStart', () => {
	const ZONE_AT = 'Australia/Adelaide';

	it('refuses a start time the clocks skipped, saying what they did', () => {
		// Source: IANA tz rule AS — 2026-10-04 02:00 ACST jumps to 03:00 ACDT.
		const result = resolveSlotStart('2026-10-04', '02:30', ZONE_AT);
		expect(result.ok).toBe(false);
		expect(!result.ok && result.problem).toBe(
			'On Sun 4 Oct 2026 the clocks in Australia/Adelaide went forward an hour at 2:00 am (ACST) ' +
				'to 3:00 am (ACDT), so 2:30 am did not happen that day. Choose another time.'
		);
	});

	it('asks which one for a repeated time, and takes the one chosen', () => {
		// Source: IANA tz rule AS — 2026-04-05 02:30 happens at 16:00Z (ACDT) and 17:00Z (ACST).
		const unchosen = resolveSlotStart('2026-04-05', '02:30', ZONE_AT);
		expect(!unchosen.ok && unchosen.problem).toContain('happened twice');
		expect(!unchosen.ok && unchosen.problem).toContain('Say which one you mean.');
		expect(resolveSlotStart('2026-04-05', '02:30', ZONE_AT, 'earlier')).toEqual({
			ok: true,
			start: new Date('2026-04-04T16:00:00Z')
		});
		expect(resolveSlotStart('2026-04-05', '02:30', ZONE_AT, 'later')).toEqual({
			ok: true,
			start: new Date('2026-04-04T17:00:00Z')
		});
		// An ordinary time ignores the choice.
		expect(resolveSlotStart('2026-04-05', '09:00', ZONE_AT, 'later')).toEqual({
			ok: true,
			start: new Date('2026-04-04T23:30:00Z')
		});
	});

	it('offers both readings of a repeated time and finds which one a saved slot is', () => {
		// Source: IANA tz rule AS and 'australasia' abbreviations ACDT/ACST.
		expect(repeatedTimeOptions('2026-04-05', '02:30', ZONE_AT)).toEqual([
			{ value: 'earlier', label: '2:30 am ACDT (first)' },
			{ value: 'later', label: '2:30 am ACST (second)' }
		]);
		expect(repeatedTimeOptions('2026-04-05', '09:00', ZONE_AT)).toEqual([]);
		expect(repeatedTimeOptions('2026-02-31', '09:00', ZONE_AT)).toEqual([]);
		expect(repeatedTimeChoiceOf(new Date('2026-04-04T16:00:00Z'), ZONE_AT)).toBe('earlier');
		expect(repeatedTimeChoiceOf(new Date('2026-04-04T17:00:00Z'), ZONE_AT)).toBe('later');
		expect(repeatedTimeChoiceOf(new Date('2026-04-04T23:30:00Z'), ZONE_AT)).toBe('');
	});
});

describe('formatSlotLabel and formatSlotStart', () => {
	const ZONE_AT = 'Australia/Adelaide';
	const NOW = new Date('2026-03-01T00:00:00Z');

	it('adds the zone abbreviation only where two times could read alike', () => {
		// Source: IANA tz rule AS, 2026 changes; abbreviations ACST/ACDT.
		expect(
			formatSlotLabel({ start: '2026-04-04T23:30:00Z', end: '2026-04-05T01:30:00Z' }, ZONE_AT, NOW)
		).toBe('Sun 5 Apr, 9:00 am – 11:00 am');
		// Starts in the repeated hour and ends after the change: both times tagged.
		expect(
			formatSlotLabel({ start: '2026-04-04T16:00:00Z', end: '2026-04-04T19:00:00Z' }, ZONE_AT, NOW)
		).toBe('Sun 5 Apr, 2:30 am ACDT – 4:30 am ACST');
		// The second 2:30 am reads differently from the first.
		expect(formatSlotStart(new Date('2026-04-04T17:00:00Z'), ZONE_AT, NOW)).toBe(
			'Sun 5 Apr, 2:30 am ACST'
		);
		// Across the October jump: 12:30 am ACST to 3:30 am ACDT is two hours, not three.
		expect(
			formatSlotLabel({ start: '2026-10-03T15:00:00Z', end: '2026-10-03T17:00:00Z' }, ZONE_AT, NOW)
		).toBe('Sun 4 Oct, 12:30 am ACST – 3:30 am ACDT');
	});

	it('names the year when the slot is not in this year', () => {
		expect(
			formatSlotLabel(
				{ start: '2027-01-05T23:30:00Z', end: '2027-01-06T01:30:00Z' },
				ZONE_AT,
				new Date('2026-12-02T00:00:00Z')
			)
		).toBe('Wed 6 Jan 2027, 10:00 am – 12:00 pm');
	});
});

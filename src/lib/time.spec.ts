import { describe, expect, it } from 'vitest';
import {
	DEFAULT_TIME_ZONE,
	describeClockChange,
	formatDay,
	formatDayTime,
	formatDayTimeRange,
	formatInZone,
	formatRecordDayTime,
	isRepeatedWallTime,
	localToUtc,
	resolveLocalTime,
	utcOffsetMinutes,
	zoneAbbreviation
} from './time';

// Facts below come from the IANA tz database, 'australasia' file, zone Australia/Adelaide with
// rule 'AS': standard time UTC+9:30, daylight time UTC+10:30 from the first Sunday of October
// 02:00 standard time to the first Sunday of April 03:00 daylight time.
const ZONE = 'Australia/Adelaide';

describe('utcOffsetMinutes', () => {
	it('is +9:30 in winter and +10:30 in summer', () => {
		expect(DEFAULT_TIME_ZONE).toBe(ZONE);
		// Source: IANA tz 'australasia', Australia/Adelaide standard offset 9:30 = 570 min.
		expect(utcOffsetMinutes(new Date('2026-07-01T00:00:00Z'), ZONE)).toBe(570);
		// Source: IANA tz 'australasia', rule AS saves 1:00 -> 10:30 = 630 min in January.
		expect(utcOffsetMinutes(new Date('2026-01-15T00:00:00Z'), ZONE)).toBe(630);
	});

	it('daylight saving ends 5 April 2026 at 03:00 local (16:30 UTC the day before)', () => {
		// Source: IANA tz rule AS, first Sunday of April 2026 = 5 April; 03:00 at +10:30 is
		// 2026-04-04T16:30Z.
		expect(utcOffsetMinutes(new Date('2026-04-04T16:29:59Z'), ZONE)).toBe(630);
		expect(utcOffsetMinutes(new Date('2026-04-04T16:30:00Z'), ZONE)).toBe(570);
	});

	it('daylight saving starts 4 October 2026 at 02:00 local (16:30 UTC the day before)', () => {
		// Source: IANA tz rule AS, first Sunday of October 2026 = 4 October; 02:00 at +9:30 is
		// 2026-10-03T16:30Z.
		expect(utcOffsetMinutes(new Date('2026-10-03T16:29:59Z'), ZONE)).toBe(570);
		expect(utcOffsetMinutes(new Date('2026-10-03T16:30:00Z'), ZONE)).toBe(630);
	});

	it('daylight saving ends 4 April 2027', () => {
		// Date calculation: 1 Jan 2026 is a Thursday; 2026 has 365 days (52 weeks + 1 day), so
		// 1 Jan 2027 is a Friday. Jan has 31 days (+3 weekdays) -> 1 Feb Monday; Feb 2027 has
		// 28 days (+0) -> 1 Mar Monday; Mar has 31 (+3) -> 1 Apr Thursday; the first Sunday of
		// April 2027 is therefore 4 April. Checked here with the calendar too.
		expect(new Date(Date.UTC(2027, 3, 1)).getUTCDay()).toBe(4); // Thursday
		expect(new Date(Date.UTC(2027, 3, 4)).getUTCDay()).toBe(0); // Sunday
		// Source: IANA tz rule AS; 03:00 at +10:30 on 4 April 2027 is 2027-04-03T16:30Z.
		expect(utcOffsetMinutes(new Date('2027-04-03T16:29:59Z'), ZONE)).toBe(630);
		expect(utcOffsetMinutes(new Date('2027-04-03T16:30:00Z'), ZONE)).toBe(570);
	});
});

describe('localToUtc', () => {
	it('converts ordinary winter and summer times', () => {
		// Source: IANA tz, Adelaide +9:30 in July: 09:00 local = 23:30 UTC the day before.
		expect(localToUtc('2026-07-01', '09:00', ZONE).toISOString()).toBe('2026-06-30T23:30:00.000Z');
		// Source: IANA tz, Adelaide +10:30 in January: 12:00 local = 01:30 UTC.
		expect(localToUtc('2026-01-15', '12:00', ZONE).toISOString()).toBe('2026-01-15T01:30:00.000Z');
	});

	it('moves a time in the skipped hour forward by the jump', () => {
		// Source: IANA tz rule AS, 4 Oct 2026 clocks go 02:00 -> 03:00, so 02:30 does not exist.
		// Our documented rule reads it at the old offset (+9:30): 02:30 + 9:30 -> 17:00Z, shown
		// as 03:30 daylight time.
		const instant = localToUtc('2026-10-04', '02:30', ZONE);
		expect(instant.toISOString()).toBe('2026-10-03T17:00:00.000Z');
		expect(formatInZone(instant, ZONE, 'HH:mm xxx')).toBe('03:30 +10:30');
	});

	it('picks the earlier instant in the repeated hour', () => {
		// Source: IANA tz rule AS, 5 Apr 2026 clocks go 03:00 -> 02:00, so 02:30 happens at
		// +10:30 (16:00Z) and again at +9:30 (17:00Z); our documented rule picks the first.
		const instant = localToUtc('2026-04-05', '02:30', ZONE);
		expect(instant.toISOString()).toBe('2026-04-04T16:00:00.000Z');
		expect(formatInZone(instant, ZONE, 'HH:mm xxx')).toBe('02:30 +10:30');
		expect(formatInZone(new Date('2026-04-04T17:00:00Z'), ZONE, 'HH:mm xxx')).toBe('02:30 +09:30');
	});

	it('round-trips every half hour across the October change', () => {
		// Source: IANA tz rule AS; every wall-clock time outside the skipped hour maps back to
		// itself when formatted in the same zone.
		for (let minutes = 0; minutes < 48 * 60; minutes += 30) {
			const instant = new Date(Date.parse('2026-10-03T00:00:00Z') + minutes * 60_000);
			const date = formatInZone(instant, ZONE, 'yyyy-MM-dd');
			const time = formatInZone(instant, ZONE, 'HH:mm');
			expect(localToUtc(date, time, ZONE).getTime()).toBe(instant.getTime());
		}
	});

	it('rejects malformed or impossible dates', () => {
		// Source: Gregorian calendar — February 2026 has 28 days.
		expect(() => localToUtc('2026-02-29', '10:00', ZONE)).toThrow(RangeError);
		expect(() => localToUtc('2026-02-28', '24:00', ZONE)).toThrow(RangeError);
		expect(() => localToUtc('28/02/2026', '10:00', ZONE)).toThrow(RangeError);
		expect(() => localToUtc('2026-02-28', '10:00', 'Mars/Olympus')).toThrow(RangeError);
	});
});

describe('formatInZone', () => {
	it('shows the same instant on the Adelaide wall clock', () => {
		// Source: IANA tz, Adelaide +10:30 on 1 Jan 2026: 00:00Z -> 10:30 local.
		expect(formatInZone(new Date('2026-01-01T00:00:00Z'), ZONE, 'yyyy-MM-dd HH:mm')).toBe(
			'2026-01-01 10:30'
		);
		// Source: IANA tz, UTC itself has offset 0.
		expect(formatInZone(new Date('2026-01-01T00:00:00Z'), 'UTC', 'yyyy-MM-dd HH:mm')).toBe(
			'2026-01-01 00:00'
		);
	});
});

describe('resolveLocalTime', () => {
	it('finds one, two or no instants for a wall-clock time', () => {
		// Source: IANA tz rule AS — 2026-04-05 02:30 happens at +10:30 (16:00Z on the 4th) and
		// again at +9:30 (17:00Z); 2026-10-04 02:30 is skipped (02:00 jumps to 03:00, 16:30Z).
		expect(resolveLocalTime('2026-06-10', '09:00', ZONE)).toEqual({
			kind: 'exact',
			instant: new Date('2026-06-09T23:30:00Z')
		});
		expect(resolveLocalTime('2026-04-05', '02:30', ZONE)).toEqual({
			kind: 'repeated',
			earlier: new Date('2026-04-04T16:00:00Z'),
			later: new Date('2026-04-04T17:00:00Z')
		});
		expect(resolveLocalTime('2026-10-04', '02:30', ZONE)).toEqual({
			kind: 'skipped',
			change: new Date('2026-10-03T16:30:00Z'),
			offsetBefore: 570,
			offsetAfter: 630
		});
		// The edges: 02:00 on the October day is skipped, 03:00 is real; 03:00 in April is once.
		expect(resolveLocalTime('2026-10-04', '02:00', ZONE).kind).toBe('skipped');
		expect(resolveLocalTime('2026-10-04', '03:00', ZONE).kind).toBe('exact');
		expect(resolveLocalTime('2026-04-05', '03:00', ZONE).kind).toBe('exact');
		expect(resolveLocalTime('2026-04-05', '01:59', ZONE).kind).toBe('exact');
	});
});

describe('zoneAbbreviation and isRepeatedWallTime', () => {
	it('names Adelaide standard and daylight time', () => {
		// Source: IANA tz 'australasia' — Australia/Adelaide abbreviations AC%sT (ACST/ACDT).
		expect(zoneAbbreviation(new Date('2026-07-01T00:00:00Z'), ZONE)).toBe('ACST');
		expect(zoneAbbreviation(new Date('2026-01-15T00:00:00Z'), ZONE)).toBe('ACDT');
		// Both passes of 2:30 am on 5 April 2026 read alike without it.
		expect(zoneAbbreviation(new Date('2026-04-04T16:00:00Z'), ZONE)).toBe('ACDT');
		expect(zoneAbbreviation(new Date('2026-04-04T17:00:00Z'), ZONE)).toBe('ACST');
	});

	it('says which instants fall in the repeated hour', () => {
		// Source: IANA tz rule AS — the repeated hour on 5 April 2026 is 02:00–02:59 local.
		expect(isRepeatedWallTime(new Date('2026-04-04T16:00:00Z'), ZONE)).toBe(true);
		expect(isRepeatedWallTime(new Date('2026-04-04T17:00:00Z'), ZONE)).toBe(true);
		expect(isRepeatedWallTime(new Date('2026-04-04T17:30:00Z'), ZONE)).toBe(false);
		expect(isRepeatedWallTime(new Date('2026-06-09T23:30:00Z'), ZONE)).toBe(false);
	});
});

describe('describeClockChange', () => {
	it('says what the clock did, in words', () => {
		// Source: IANA tz rule AS, 2026 changes.
		expect(describeClockChange('2026-10-04', '02:30', ZONE)).toBe(
			'On Sun 4 Oct 2026 the clocks in Australia/Adelaide went forward an hour at 2:00 am (ACST) ' +
				'to 3:00 am (ACDT), so 2:30 am did not happen that day.'
		);
		expect(describeClockChange('2026-04-05', '02:30', ZONE)).toBe(
			'On Sun 5 Apr 2026 the clocks in Australia/Adelaide went back an hour at 3:00 am (ACDT) ' +
				'to 2:00 am (ACST), so 2:30 am happened twice: first on ACDT, then on ACST.'
		);
		expect(describeClockChange('2026-04-05', '09:00', ZONE)).toBeNull();
	});

	it('handles a half-hour change', () => {
		// Source: IANA tz 'australasia' — Australia/Lord_Howe saves 0:30; daylight time ends the
		// first Sunday of April at 02:00 daylight time (LHDT), back to 01:30 standard (LHST).
		expect(describeClockChange('2026-04-05', '01:45', 'Australia/Lord_Howe')).toBe(
			'On Sun 5 Apr 2026 the clocks in Australia/Lord_Howe went back 30 minutes at 2:00 am ' +
				'(LHDT) to 1:30 am (LHST), so 1:45 am happened twice: first on LHDT, then on LHST.'
		);
	});
});

describe('formatDay and formatDayTime: one date style for people', () => {
	// Calendar facts (from memory, checkable on any calendar): 8 Dec 2026 is a Tuesday,
	// 5 Jan 2027 a Tuesday.
	const now = new Date('2026-12-02T00:00:00Z');

	it('leaves the year out for this year and writes it for any other', () => {
		expect(formatDay('2026-12-08', ZONE, now)).toBe('Tue 8 Dec');
		expect(formatDay('2027-01-05', ZONE, now)).toBe('Tue 5 Jan 2027');
	});

	it('reads an instant in the zone: 20:00 UTC on 7 Dec is already the 8th in Adelaide', () => {
		// Source: IANA tz 'australasia', Adelaide is UTC+10:30 in December.
		expect(formatDay(new Date('2026-12-07T20:00:00Z'), ZONE, now)).toBe('Tue 8 Dec');
		expect(formatDayTime(new Date('2026-12-07T20:00:00Z'), ZONE, now)).toBe('Tue 8 Dec, 6:30 am');
	});

	it('says "this year" by the zone: 31 Dec 14:00 UTC is New Year in Adelaide', () => {
		const newYearInAdelaide = new Date('2026-12-31T14:00:00Z');
		expect(formatDay('2027-01-05', ZONE, newYearInAdelaide)).toBe('Tue 5 Jan');
	});
});

describe('formatDayTimeRange: a booked slot in the same style', () => {
	// Source: IANA tz 'australasia', Adelaide is UTC+10:30 in December (daylight time).
	const now = new Date('2026-12-02T00:00:00Z');

	it('writes the day once when the span ends the same day', () => {
		const start = new Date('2026-12-07T22:30:00Z'); // Tue 8 Dec, 9:00 am in Adelaide
		const end = new Date('2026-12-08T00:30:00Z'); // 11:00 am
		expect(formatDayTimeRange(start, end, ZONE, now)).toBe('Tue 8 Dec, 9:00 am – 11:00 am');
	});

	it('writes both days when the span runs past midnight, with the year when not this year', () => {
		const start = new Date('2027-01-05T05:30:00Z'); // Tue 5 Jan 2027, 4:00 pm
		const end = new Date('2027-01-05T22:30:00Z'); // Wed 6 Jan 2027, 9:00 am
		expect(formatDayTimeRange(start, end, ZONE, now)).toBe(
			'Tue 5 Jan 2027, 4:00 pm – Wed 6 Jan 2027, 9:00 am'
		);
	});
});

describe('formatRecordDayTime: dates on receipts and statements', () => {
	it('always carries the year, this year too', () => {
		// Source: IANA tz 'australasia', Adelaide is UTC+10:30 in December; 8 Dec 2026 is a
		// Tuesday (from memory, checkable on any calendar).
		const thisYear = new Date().getUTCFullYear();
		const instant = new Date(`${thisYear}-06-15T00:00:00Z`);
		expect(formatRecordDayTime(instant, ZONE)).toContain(String(thisYear));
		expect(formatRecordDayTime(new Date('2026-12-07T20:00:00Z'), ZONE)).toBe(
			'Tue 8 Dec 2026, 6:30 am'
		);
	});
});

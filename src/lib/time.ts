/**
 * Time helpers. Tapline stores instants in UTC and shows them in an IANA zone; these functions
 * are the only place wall-clock times are turned into instants and back.
 */
import { tz, tzOffset } from '@date-fns/tz';
import { format } from 'date-fns';

/** The demo market's zone (IANA tz database, 'australasia' file). */
export const DEFAULT_TIME_ZONE = 'Australia/Adelaide';

const MS_PER_MINUTE = 60_000;
// Real zones change offset at most once in any two-day window, so offsets a day either side
// of a wall-clock time give the only two candidate offsets.
const PROBE_MS = 24 * 60 * MS_PER_MINUTE;

/**
 * Throws a RangeError unless `zone` is an IANA zone name the runtime knows.
 * @param zone e.g. 'Australia/Adelaide'
 */
export function assertTimeZone(zone: string): void {
	try {
		new Intl.DateTimeFormat('en-AU', { timeZone: zone });
	} catch {
		throw new RangeError(`Unknown time zone: ${zone}`);
	}
}

/**
 * The zone's offset from UTC at an instant, in minutes east of UTC
 * (Australia/Adelaide: 570 in winter, 630 in daylight saving).
 * @param date the instant
 * @param zone IANA zone name
 */
export function utcOffsetMinutes(date: Date, zone: string = DEFAULT_TIME_ZONE): number {
	assertTimeZone(zone);
	assertValidDate(date);
	return tzOffset(zone, date);
}

/**
 * Converts a wall-clock date and time in a zone to the UTC instant.
 *
 * Daylight-saving edges follow the 'compatible' rule (the same as JavaScript's Temporal):
 * - a time in the skipped hour (e.g. 02:30 on the spring-forward day) does not exist; it is
 *   read with the offset in force before the jump, so it lands one hour later on the clock
 *   (02:30 becomes 03:30 daylight time);
 * - a time in the repeated hour (e.g. 02:30 on the fall-back day) happens twice; the earlier
 *   instant, still on daylight time, is returned.
 * @param dateStr 'YYYY-MM-DD'
 * @param timeStr 'HH:mm' (24-hour)
 * @param zone IANA zone name
 */
export function localToUtc(
	dateStr: string,
	timeStr: string,
	zone: string = DEFAULT_TIME_ZONE
): Date {
	assertTimeZone(zone);
	const wallClockMs = parseWallClock(dateStr, timeStr);
	const offsetBefore = tzOffset(zone, new Date(wallClockMs - PROBE_MS));
	const offsetAfter = tzOffset(zone, new Date(wallClockMs + PROBE_MS));
	const candidates = [offsetBefore, offsetAfter]
		.map((offset) => wallClockMs - offset * MS_PER_MINUTE)
		// A candidate is real when the zone's offset at that instant is the one we assumed.
		.filter(
			(instant) => wallClockMs - tzOffset(zone, new Date(instant)) * MS_PER_MINUTE === instant
		);
	if (candidates.length === 0) {
		// Skipped hour: read with the pre-jump offset.
		return new Date(wallClockMs - offsetBefore * MS_PER_MINUTE);
	}
	return new Date(Math.min(...candidates));
}

/**
 * Formats an instant as wall-clock time in a zone with a date-fns pattern.
 * @param date the instant
 * @param zone IANA zone name
 * @param pattern date-fns format pattern, e.g. 'EEE d MMM yyyy, h:mm a'
 */
export function formatInZone(date: Date, zone: string, pattern: string): string {
	assertTimeZone(zone);
	assertValidDate(date);
	return format(date, pattern, { in: tz(zone) });
}

function parseWallClock(dateStr: string, timeStr: string): number {
	const dateMatch = /^(\d{4})-(\d{2})-(\d{2})$/.exec(dateStr);
	const timeMatch = /^(\d{2}):(\d{2})$/.exec(timeStr);
	if (!dateMatch || !timeMatch) {
		throw new RangeError(`Expected 'YYYY-MM-DD' and 'HH:mm', got '${dateStr}' '${timeStr}'`);
	}
	const [year, month, day] = dateMatch.slice(1).map(Number) as [number, number, number];
	const [hour, minute] = timeMatch.slice(1).map(Number) as [number, number];
	const ms = Date.UTC(year, month - 1, day, hour, minute);
	const check = new Date(ms);
	// Date.UTC rolls 31 February into March; reject instead of guessing.
	if (
		hour > 23 ||
		minute > 59 ||
		check.getUTCFullYear() !== year ||
		check.getUTCMonth() !== month - 1 ||
		check.getUTCDate() !== day
	) {
		throw new RangeError(`Not a real date and time: ${dateStr} ${timeStr}`);
	}
	return ms;
}

function assertValidDate(date: Date): void {
	if (Number.isNaN(date.getTime())) throw new RangeError('Invalid date');
}

/** Calendar dates ('YYYY-MM-DD') carry no zone: they are read and printed as UTC days. */
const CALENDAR_ZONE = 'UTC';

/**
 * A day as people read it on every Tapline page and e-mail: 'Tue 8 Dec', with the year when it
 * is not this year ('Tue 8 Dec 2027').
 * @param day a calendar date 'YYYY-MM-DD', or an instant shown in `zone`
 * @param zone IANA zone an instant is shown in (and whose calendar says what "this year" is)
 * @param now the present, for the year rule
 */
export function formatDay(
	day: string | Date,
	zone: string = DEFAULT_TIME_ZONE,
	now: Date = new Date()
): string {
	const [instant, shownIn] =
		typeof day === 'string' ? [new Date(`${day}T00:00:00Z`), CALENDAR_ZONE] : [day, zone];
	const sameYear = formatInZone(instant, shownIn, 'yyyy') === formatInZone(now, zone, 'yyyy');
	return formatInZone(instant, shownIn, sameYear ? 'EEE d MMM' : 'EEE d MMM yyyy');
}

/**
 * A moment as people read it: 'Tue 8 Dec, 2:30 pm' (year as in {@link formatDay}).
 * @param instant the moment
 * @param zone IANA zone it is shown in
 * @param now the present, for the year rule
 */
export function formatDayTime(
	instant: Date,
	zone: string = DEFAULT_TIME_ZONE,
	now: Date = new Date()
): string {
	return `${formatDay(instant, zone, now)}, ${formatInZone(instant, zone, 'h:mm a').toLowerCase()}`;
}

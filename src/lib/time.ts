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

/** How a wall-clock date and time maps to instants in a zone. */
export type LocalTimeResolution =
	| { kind: 'exact'; instant: Date }
	/** The clocks went back: the time happened twice, first on the offset before the change. */
	| { kind: 'repeated'; earlier: Date; later: Date }
	/** The clocks went forward over it: the time never happened that day. */
	| { kind: 'skipped'; change: Date; offsetBefore: number; offsetAfter: number };

/**
 * What a wall-clock date and time is in a zone: one instant, two (the repeated hour when the
 * clocks go back) or none (the hour skipped when they go forward).
 * @param dateStr 'YYYY-MM-DD'
 * @param timeStr 'HH:mm' (24-hour)
 * @param zone IANA zone name
 */
export function resolveLocalTime(
	dateStr: string,
	timeStr: string,
	zone: string = DEFAULT_TIME_ZONE
): LocalTimeResolution {
	assertTimeZone(zone);
	const wallClockMs = parseWallClock(dateStr, timeStr);
	const offsetBefore = tzOffset(zone, new Date(wallClockMs - PROBE_MS));
	const offsetAfter = tzOffset(zone, new Date(wallClockMs + PROBE_MS));
	const candidates = [...new Set([offsetBefore, offsetAfter])]
		.map((offset) => wallClockMs - offset * MS_PER_MINUTE)
		// A candidate is real when the zone's offset at that instant is the one we assumed.
		.filter(
			(instant) => wallClockMs - tzOffset(zone, new Date(instant)) * MS_PER_MINUTE === instant
		)
		.sort((a, b) => a - b);
	const [first, second] = candidates;
	if (first === undefined) {
		const change = firstOffsetChange(
			zone,
			wallClockMs - offsetBefore * MS_PER_MINUTE - PROBE_MS,
			wallClockMs - offsetBefore * MS_PER_MINUTE
		);
		return { kind: 'skipped', change, offsetBefore, offsetAfter };
	}
	if (second === undefined) return { kind: 'exact', instant: new Date(first) };
	return { kind: 'repeated', earlier: new Date(first), later: new Date(second) };
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
 * Where a person chose the time (a quote slot), use {@link resolveLocalTime} instead and ask.
 * @param dateStr 'YYYY-MM-DD'
 * @param timeStr 'HH:mm' (24-hour)
 * @param zone IANA zone name
 */
export function localToUtc(
	dateStr: string,
	timeStr: string,
	zone: string = DEFAULT_TIME_ZONE
): Date {
	const resolved = resolveLocalTime(dateStr, timeStr, zone);
	if (resolved.kind === 'exact') return resolved.instant;
	if (resolved.kind === 'repeated') return resolved.earlier;
	// Skipped hour: read with the pre-jump offset.
	return new Date(parseWallClock(dateStr, timeStr) - resolved.offsetBefore * MS_PER_MINUTE);
}

/**
 * The zone's short name at an instant, e.g. 'ACDT' or 'ACST' for Australia/Adelaide (from the
 * runtime's time-zone data, en-AU names); zones without a short name in that locale give their
 * offset, e.g. 'GMT+1'.
 * @param date the instant
 * @param zone IANA zone name
 */
export function zoneAbbreviation(date: Date, zone: string = DEFAULT_TIME_ZONE): string {
	assertTimeZone(zone);
	assertValidDate(date);
	const parts = new Intl.DateTimeFormat('en-AU', {
		timeZone: zone,
		timeZoneName: 'short'
	}).formatToParts(date);
	return parts.find((part) => part.type === 'timeZoneName')?.value ?? zone;
}

/**
 * Whether the wall-clock time of an instant happened twice that day in the zone (the repeated
 * hour when the clocks go back), so it needs the zone abbreviation to be read one way.
 * @param date the instant
 * @param zone IANA zone name
 */
export function isRepeatedWallTime(date: Date, zone: string = DEFAULT_TIME_ZONE): boolean {
	const local = formatInZone(date, zone, 'yyyy-MM-dd HH:mm').split(' ');
	return resolveLocalTime(local[0] ?? '', local[1] ?? '', zone).kind === 'repeated';
}

/**
 * Says in words what the clocks did around a wall-clock time that was skipped or repeated,
 * e.g. "On Sun 4 Oct 2026 the clocks in Australia/Adelaide went forward an hour at 2:00 am
 * (ACST) to 3:00 am (ACDT), so 2:30 am did not happen that day."; null for an ordinary time.
 * @param dateStr 'YYYY-MM-DD'
 * @param timeStr 'HH:mm'
 * @param zone IANA zone name
 */
export function describeClockChange(
	dateStr: string,
	timeStr: string,
	zone: string = DEFAULT_TIME_ZONE
): string | null {
	const resolved = resolveLocalTime(dateStr, timeStr, zone);
	if (resolved.kind === 'exact') return null;
	const day = formatInZone(localToUtc(dateStr, '12:00', zone), zone, 'EEE d MMM yyyy');
	const asked = wallTimeWords(timeStr);
	const change =
		resolved.kind === 'skipped'
			? resolved.change
			: firstOffsetChange(zone, resolved.earlier.getTime(), resolved.later.getTime());
	const before = new Date(change.getTime() - 1);
	const clock = (d: Date, offsetMinutes: number) =>
		lowerMeridiem(
			format(new Date(d.getTime() + offsetMinutes * MS_PER_MINUTE), 'h:mm a', { in: tz('UTC') })
		);
	const from = `${clock(change, tzOffset(zone, before))} (${zoneAbbreviation(before, zone)})`;
	const to = `${clock(change, tzOffset(zone, change))} (${zoneAbbreviation(change, zone)})`;
	const shift = Math.abs(tzOffset(zone, change) - tzOffset(zone, before));
	const amount = shift === 60 ? 'an hour' : `${String(shift)} minutes`;
	if (resolved.kind === 'skipped') {
		return `On ${day} the clocks in ${zone} went forward ${amount} at ${from} to ${to}, so ${asked} did not happen that day.`;
	}
	return `On ${day} the clocks in ${zone} went back ${amount} at ${from} to ${to}, so ${asked} happened twice: first on ${zoneAbbreviation(resolved.earlier, zone)}, then on ${zoneAbbreviation(resolved.later, zone)}.`;
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

/** The first instant (to the minute) after `fromMs` whose offset differs from `fromMs`'s. */
function firstOffsetChange(zone: string, fromMs: number, toMs: number): Date {
	const startOffset = tzOffset(zone, new Date(fromMs));
	let low = Math.floor(fromMs / MS_PER_MINUTE);
	let high = Math.ceil(toMs / MS_PER_MINUTE);
	if (tzOffset(zone, new Date(high * MS_PER_MINUTE)) === startOffset) {
		return new Date(high * MS_PER_MINUTE);
	}
	// Invariant: the offset at `low` is the start offset, at `high` it has changed.
	while (high - low > 1) {
		const mid = Math.floor((low + high) / 2);
		if (tzOffset(zone, new Date(mid * MS_PER_MINUTE)) === startOffset) low = mid;
		else high = mid;
	}
	return new Date(high * MS_PER_MINUTE);
}

function wallTimeWords(timeStr: string): string {
	const [hour, minute] = timeStr.split(':').map(Number) as [number, number];
	return lowerMeridiem(
		format(new Date(Date.UTC(2000, 0, 1, hour, minute)), 'h:mm a', { in: tz('UTC') })
	);
}

function lowerMeridiem(text: string): string {
	return text.replace('AM', 'am').replace('PM', 'pm');
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

/**
 * A day and time for a record kept for years (receipts, statements, tax invoices): always with
 * the year, 'Tue 8 Dec 2026, 9:00 am', whatever year it is now.
 */
export function formatRecordDayTime(instant: Date, zone: string = DEFAULT_TIME_ZONE): string {
	const day = formatInZone(instant, zone, 'EEE d MMM yyyy');
	return `${day}, ${formatInZone(instant, zone, 'h:mm a').toLowerCase()}`;
}

/**
 * A span of time as people read it: 'Tue 8 Dec, 9:00 am – 11:00 am', or with both days when it
 * ends on another day ('Tue 8 Dec, 4:00 pm – Wed 9 Dec, 9:00 am'); days as in {@link formatDay}.
 * @param start the first moment
 * @param end the last moment
 * @param zone IANA zone both are shown in
 * @param now the present, for the year rule
 */
export function formatDayTimeRange(
	start: Date,
	end: Date,
	zone: string = DEFAULT_TIME_ZONE,
	now: Date = new Date()
): string {
	const sameDay = formatInZone(start, zone, 'yyyy-MM-dd') === formatInZone(end, zone, 'yyyy-MM-dd');
	const finish = sameDay
		? formatInZone(end, zone, 'h:mm a').toLowerCase()
		: formatDayTime(end, zone, now);
	return `${formatDayTime(start, zone, now)} – ${finish}`;
}

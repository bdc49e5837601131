/**
 * Working hours and bookable slots. Hours are wall-clock times in the installer's IANA zone;
 * slots and bookings are UTC instants. Every wall-clock-to-instant step goes through
 * localToUtc, so daylight-saving days come out right: on the spring-forward day a 9-hour block
 * holds 8 real hours of slots, on the fall-back day 10.
 */
import {
	describeClockChange,
	formatDay,
	formatInZone,
	isRepeatedWallTime,
	localToUtc,
	resolveLocalTime,
	utcOffsetMinutes,
	zoneAbbreviation
} from '../time';

/** 0 = Sunday … 6 = Saturday, as JavaScript's Date counts them. */
export type Weekday = 0 | 1 | 2 | 3 | 4 | 5 | 6;

/** One block of working hours on a weekday, 'HH:mm' wall-clock, end after start. */
export type WorkingBlock = { weekday: Weekday; start: string; end: string };

/** An installer's regular week; a weekday may have several blocks (e.g. around lunch). */
export type WeeklyHours = WorkingBlock[];

/** A local date with no work at all, 'YYYY-MM-DD' in the installer's zone. */
export type BlockedDate = string;

/** Half-open span of time [start, end) between two UTC instants. */
export type Interval = { start: Date; end: Date };

/** Inputs for {@link candidateSlots}. */
export type CandidateSlotOptions = {
	hours: WeeklyHours;
	blocked: readonly BlockedDate[];
	bookings: readonly Interval[];
	timeZone: string;
	/** No slot starts before this instant; the search starts on its local date. */
	from: Date;
	/** Number of local calendar days to search, starting with from's. */
	days: number;
	durationMinutes: number;
	stepMinutes?: number;
};

export const WEEKDAY_NAMES = [
	'Sunday',
	'Monday',
	'Tuesday',
	'Wednesday',
	'Thursday',
	'Friday',
	'Saturday'
] as const;

const MS_PER_MINUTE = 60_000;
const TIME_PATTERN = /^([01]\d|2[0-3]):[0-5]\d$/;
const DATE_PATTERN = /^\d{4}-\d{2}-\d{2}$/;

/**
 * Whether two intervals share any time. Intervals are half-open, so a job ending at 11:00 and
 * the next starting at 11:00 do not overlap.
 * @param a first interval
 * @param b second interval
 */
export function overlaps(a: Interval, b: Interval): boolean {
	return a.start.getTime() < b.end.getTime() && b.start.getTime() < a.end.getTime();
}

/**
 * Whether a slot clashes with none of the bookings.
 * @param slot the proposed slot
 * @param bookings existing bookings
 */
export function isFree(slot: Interval, bookings: readonly Interval[]): boolean {
	return !bookings.some((booking) => overlaps(slot, booking));
}

/**
 * Whether a slot lies wholly inside one working-hours block of its local day, and that day is
 * not blocked. A slot that runs from one block into the next (e.g. across lunch) does not fit.
 * @param slot the proposed slot (UTC instants)
 * @param hours the installer's weekly hours
 * @param blocked local dates with no work
 * @param timeZone the installer's IANA zone
 */
export function isWithinWorkingHours(
	slot: Interval,
	hours: WeeklyHours,
	blocked: readonly BlockedDate[],
	timeZone: string
): boolean {
	assertInterval(slot);
	const localDate = formatInZone(slot.start, timeZone, 'yyyy-MM-dd');
	if (blocked.includes(localDate)) return false;
	return blocksOn(localDate, hours, timeZone).some(
		(block) =>
			block.start.getTime() <= slot.start.getTime() && slot.end.getTime() <= block.end.getTime()
	);
}

/**
 * Free slots of `durationMinutes` inside working hours over the next `days` local days.
 * Slots start at the beginning of each block and every `stepMinutes` of real elapsed time after
 * it, so the skipped hour on the spring-forward day yields no slots and the repeated hour on the
 * fall-back day yields slots for both of its passes.
 * @param options hours, blocked dates, existing bookings, zone, search window and slot size
 * @returns slots sorted by start, as UTC instants
 */
export function candidateSlots(options: CandidateSlotOptions): Interval[] {
	const { hours, blocked, bookings, timeZone, from, days, durationMinutes } = options;
	const stepMinutes = options.stepMinutes ?? 30;
	if (!Number.isSafeInteger(days) || days < 0) throw new RangeError('days must be a whole number');
	if (!Number.isSafeInteger(durationMinutes) || durationMinutes <= 0) {
		throw new RangeError('durationMinutes must be a whole number > 0');
	}
	if (!Number.isSafeInteger(stepMinutes) || stepMinutes <= 0) {
		throw new RangeError('stepMinutes must be a whole number > 0');
	}
	const problems = validateWeeklyHours(hours);
	if (problems.length > 0) throw new RangeError(problems.join(' '));

	const durationMs = durationMinutes * MS_PER_MINUTE;
	const stepMs = stepMinutes * MS_PER_MINUTE;
	const firstDate = formatInZone(from, timeZone, 'yyyy-MM-dd');
	const slots: Interval[] = [];
	for (let offset = 0; offset < days; offset++) {
		const localDate = addDays(firstDate, offset);
		if (blocked.includes(localDate)) continue;
		for (const block of blocksOn(localDate, hours, timeZone)) {
			for (
				let start = block.start.getTime();
				start + durationMs <= block.end.getTime();
				start += stepMs
			) {
				if (start < from.getTime()) continue;
				const slot = { start: new Date(start), end: new Date(start + durationMs) };
				if (isFree(slot, bookings)) slots.push(slot);
			}
		}
	}
	return slots.sort((a, b) => a.start.getTime() - b.start.getTime());
}

/**
 * Checks weekly hours for mistakes an installer could make in the hours form.
 * @param hours the weekly hours as entered
 * @returns messages fit to show next to the form, empty when the hours are usable
 */
export function validateWeeklyHours(hours: WeeklyHours): string[] {
	const problems: string[] = [];
	const valid: WorkingBlock[] = [];
	for (const block of hours) {
		const day = WEEKDAY_NAMES[block.weekday] as string | undefined;
		if (day === undefined) {
			problems.push(`'${String(block.weekday)}' is not a day of the week (0 = Sunday to 6).`);
			continue;
		}
		const badTimes = [block.start, block.end].filter((time) => !TIME_PATTERN.test(time));
		if (badTimes.length > 0) {
			problems.push(
				`${day}: ${badTimes.map((time) => `'${time}'`).join(' and ')} should be a 24-hour time like 09:00.`
			);
			continue;
		}
		if (block.end <= block.start) {
			problems.push(`${day} ${block.start}–${block.end}: the finish must be after the start.`);
			continue;
		}
		valid.push(block);
	}
	const sorted = [...valid].sort((a, b) => a.weekday - b.weekday || a.start.localeCompare(b.start));
	for (let i = 1; i < sorted.length; i++) {
		const previous = sorted[i - 1];
		const current = sorted[i];
		if (
			previous &&
			current &&
			previous.weekday === current.weekday &&
			current.start < previous.end
		) {
			problems.push(
				`${WEEKDAY_NAMES[current.weekday]}: ${previous.start}–${previous.end} overlaps ${current.start}–${current.end}.`
			);
		}
	}
	return problems;
}

/** The working blocks of one local date as UTC intervals, earliest first. */
function blocksOn(localDate: string, hours: WeeklyHours, timeZone: string): Interval[] {
	const weekday = weekdayOf(localDate);
	return hours
		.filter((block) => block.weekday === weekday)
		.map((block) => ({
			start: localToUtc(localDate, block.start, timeZone),
			end: localToUtc(localDate, block.end, timeZone)
		}))
		.filter((block) => block.start.getTime() < block.end.getTime())
		.sort((a, b) => a.start.getTime() - b.start.getTime());
}

function weekdayOf(localDate: string): number {
	const [year, month, day] = parseDate(localDate);
	// Calendar arithmetic only: a date's weekday does not depend on any zone.
	return new Date(Date.UTC(year, month - 1, day)).getUTCDay();
}

function addDays(localDate: string, days: number): string {
	const [year, month, day] = parseDate(localDate);
	return new Date(Date.UTC(year, month - 1, day + days)).toISOString().slice(0, 10);
}

function parseDate(localDate: string): [number, number, number] {
	if (!DATE_PATTERN.test(localDate))
		throw new RangeError(`Expected 'YYYY-MM-DD', got '${localDate}'`);
	const [year, month, day] = localDate.split('-').map(Number) as [number, number, number];
	return [year, month, day];
}

function assertInterval(slot: Interval): void {
	if (!(slot.start.getTime() < slot.end.getTime())) {
		throw new RangeError('A slot must end after it starts');
	}
}

/** Which pass of a repeated wall-clock time a person chose; '' when they did not say. */
export type RepeatedTimeChoice = '' | 'earlier' | 'later';

/**
 * The instant a person meant by a slot's local date and start time, or why it cannot be read:
 * a time the clocks skipped is refused with what the clocks did, and a time they repeated needs
 * the person to say which pass (never guessed, never silently moved).
 * @param date 'YYYY-MM-DD' in the zone
 * @param time 'HH:mm' in the zone
 * @param zone IANA zone name
 * @param choice for a repeated time, which pass
 */
export function resolveSlotStart(
	date: string,
	time: string,
	zone: string,
	choice: RepeatedTimeChoice = ''
): { ok: true; start: Date } | { ok: false; problem: string } {
	const resolved = resolveLocalTime(date, time, zone);
	if (resolved.kind === 'exact') return { ok: true, start: resolved.instant };
	const what = describeClockChange(date, time, zone) ?? '';
	if (resolved.kind === 'skipped') {
		return { ok: false, problem: `${what} Choose another time.` };
	}
	if (choice === '') {
		return { ok: false, problem: `${what} Say which one you mean.` };
	}
	return { ok: true, start: choice === 'earlier' ? resolved.earlier : resolved.later };
}

/**
 * The two readings of a repeated wall-clock time, for a chooser, e.g.
 * [{ value: 'earlier', label: '2:30 am ACDT (first)' }, { value: 'later', label: '2:30 am ACST (second)' }];
 * empty for an ordinary or skipped time.
 * @param date 'YYYY-MM-DD'
 * @param time 'HH:mm'
 * @param zone IANA zone name
 */
export function repeatedTimeOptions(
	date: string,
	time: string,
	zone: string
): Array<{ value: Exclude<RepeatedTimeChoice, ''>; label: string }> {
	let resolved;
	try {
		resolved = resolveLocalTime(date, time, zone);
	} catch {
		return [];
	}
	if (resolved.kind !== 'repeated') return [];
	const label = (d: Date, which: string) =>
		`${clockTime(d, zone)} ${zoneAbbreviation(d, zone)} (${which})`;
	return [
		{ value: 'earlier', label: label(resolved.earlier, 'first') },
		{ value: 'later', label: label(resolved.later, 'second') }
	];
}

/** A wall-clock time as people read it on every page: '9:00 am'. */
function clockTime(instant: Date, zone: string): string {
	return formatInZone(instant, zone, 'h:mm a').toLowerCase();
}

/**
 * A slot as local time in the one date style of time.ts, e.g. 'Wed 3 Jun, 9:00 am – 11:00 am'
 * (with the year when it is not this year). Where a time could be read two ways (it falls in
 * the hour the clocks repeat) or the slot runs across a clock change, each time carries the zone
 * abbreviation: 'Sun 5 Apr, 2:30 am ACDT – 4:30 am ACST'.
 * @param slot start and end instants (Date or ISO string)
 * @param zone IANA zone name
 * @param now the present, for the year rule
 */
export function formatSlotLabel(
	slot: { start: Date | string; end: Date | string },
	zone: string,
	now: Date = new Date()
): string {
	const start = new Date(slot.start);
	const end = new Date(slot.end);
	const spansChange = utcOffsetMinutes(start, zone) !== utcOffsetMinutes(end, zone);
	const tag = (d: Date) =>
		spansChange || isRepeatedWallTime(d, zone) ? ` ${zoneAbbreviation(d, zone)}` : '';
	return `${formatDay(start, zone, now)}, ${clockTime(start, zone)}${tag(start)} – ${clockTime(end, zone)}${tag(end)}`;
}

/**
 * A slot's start for messages, e.g. 'Sun 5 Apr, 2:30 am ACDT' (abbreviation only where the time
 * could be read two ways).
 * @param start the instant
 * @param zone IANA zone name
 * @param now the present, for the year rule
 */
export function formatSlotStart(start: Date, zone: string, now: Date = new Date()): string {
	const tag = isRepeatedWallTime(start, zone) ? ` ${zoneAbbreviation(start, zone)}` : '';
	return `${formatDay(start, zone, now)}, ${clockTime(start, zone)}${tag}`;
}

/**
 * Which pass of a repeated wall-clock time an instant is ('' when its time happens once), so a
 * form refilled from a saved slot keeps the same one.
 * @param instant the slot's start
 * @param zone IANA zone name
 */
export function repeatedTimeChoiceOf(instant: Date, zone: string): RepeatedTimeChoice {
	const resolved = resolveLocalTime(
		formatInZone(instant, zone, 'yyyy-MM-dd'),
		formatInZone(instant, zone, 'HH:mm'),
		zone
	);
	if (resolved.kind !== 'repeated') return '';
	return resolved.earlier.getTime() === instant.getTime() ? 'earlier' : 'later';
}

/**
 * The installer's week on one page: Monday to Sunday in their zone, each day with its working
 * hours (or that it is a day off) and the bookings that start on it. Pure; the calendar page's
 * load gathers the rows.
 */
import { WEEKDAY_NAMES, type BlockedDate, type WeeklyHours } from './schedule';
import { formatDay, formatInZone } from '../time';

const DATE_PATTERN = /^\d{4}-\d{2}-\d{2}$/;

/** A calendar date moved by whole days (calendar arithmetic: no zone applies). */
export function addCalendarDays(day: string, days: number): string {
	const [y, m, d] = day.split('-').map(Number) as [number, number, number];
	return new Date(Date.UTC(y, m - 1, d + days)).toISOString().slice(0, 10);
}

/** The Monday on or before a calendar date. */
export function mondayOf(day: string): string {
	const [y, m, d] = day.split('-').map(Number) as [number, number, number];
	const weekday = new Date(Date.UTC(y, m - 1, d)).getUTCDay();
	return addCalendarDays(day, -((weekday + 6) % 7));
}

/**
 * The Monday of the week a `?week=` value asks for: any real date 'YYYY-MM-DD' in that week;
 * anything else (missing, malformed, not a real date) gives this week in the zone.
 */
export function weekFromParam(param: string | null, now: Date, zone: string): string {
	if (param && DATE_PATTERN.test(param)) {
		const [y, m, d] = param.split('-').map(Number) as [number, number, number];
		const check = new Date(Date.UTC(y, m - 1, d));
		if (check.toISOString().slice(0, 10) === param) return mondayOf(param);
	}
	return mondayOf(formatInZone(now, zone, 'yyyy-MM-dd'));
}

export interface WeekBooking {
	id: string;
	jobId: string;
	start: Date;
	end: Date;
	title: string;
	suburb: string | null;
	status: 'confirmed' | 'awaiting_payment';
}

export interface WeekDay {
	date: string;
	label: string;
	today: boolean;
	/** Working hours as words, e.g. ['8:00 am – 12:00 pm']; empty when the installer does not work. */
	hours: string[];
	blocked: boolean;
	bookings: Array<Omit<WeekBooking, 'start' | 'end'> & { time: string }>;
}

const clock = (hhmm: string) => {
	const [h, m] = hhmm.split(':').map(Number) as [number, number];
	return `${String(((h + 11) % 12) + 1)}:${String(m).padStart(2, '0')} ${h < 12 ? 'am' : 'pm'}`;
};

/**
 * Seven days from `monday`, each with its hours, whether it is blocked and its bookings (by the
 * local date of their start, earliest first).
 * @param monday 'YYYY-MM-DD', a Monday
 * @param zone the installer's IANA zone
 */
export function buildWeek(input: {
	monday: string;
	hours: WeeklyHours;
	blocked: readonly BlockedDate[];
	bookings: readonly WeekBooking[];
	zone: string;
	now: Date;
}): WeekDay[] {
	const today = formatInZone(input.now, input.zone, 'yyyy-MM-dd');
	const sorted = [...input.bookings].sort((a, b) => a.start.getTime() - b.start.getTime());
	return Array.from({ length: 7 }, (_, i) => {
		const date = addCalendarDays(input.monday, i);
		const weekday = (i + 1) % 7;
		return {
			date,
			label: `${WEEKDAY_NAMES[weekday]} ${formatDay(date, input.zone, input.now).replace(/^\w+ /, '')}`,
			today: date === today,
			hours: input.hours
				.filter((h) => h.weekday === weekday)
				.sort((a, b) => a.start.localeCompare(b.start))
				.map((h) => `${clock(h.start)} – ${clock(h.end)}`),
			blocked: input.blocked.includes(date),
			bookings: sorted
				.filter((b) => formatInZone(b.start, input.zone, 'yyyy-MM-dd') === date)
				.map(({ start, end, ...rest }) => ({
					...rest,
					time: `${formatInZone(start, input.zone, 'h:mm a')} – ${formatInZone(end, input.zone, 'h:mm a')}`.toLowerCase()
				}))
		};
	});
}

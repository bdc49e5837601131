/** Installers' diaries: weekly hours, days off, and the bookings that take their time. */
import { and, asc, eq, gt, lt, or } from 'drizzle-orm';
import type { Weekday, WeeklyHours } from '$lib/work/schedule';
import { formatDay, formatInZone, localToUtc } from '$lib/time';
import { db, type Tx } from '../db';
import { booking, installerBlockedDate, installerHours } from '../db/schema';
import { refuse, type Refusal } from '../refusal';

/** Minutes after midnight as 'hh:mm'. */
const toHhMm = (minute: number) =>
	`${String(Math.floor(minute / 60)).padStart(2, '0')}:${String(minute % 60).padStart(2, '0')}`;
/** 'hh:mm' as minutes after midnight. */
const toMinute = (hhmm: string) => Number(hhmm.slice(0, 2)) * 60 + Number(hhmm.slice(3, 5));

/** The installer's weekly hours as wall-clock blocks. */
export async function getWeeklyHours(
	installerId: string,
	tx: Tx | typeof db = db
): Promise<WeeklyHours> {
	const rows = await tx
		.select()
		.from(installerHours)
		.where(eq(installerHours.installerId, installerId))
		.orderBy(asc(installerHours.weekday), asc(installerHours.startMinute));
	return rows.map((r) => ({
		weekday: r.weekday as Weekday,
		start: toHhMm(r.startMinute),
		end: toHhMm(r.endMinute)
	}));
}

/** Replaces the weekly hours (already validated with validateWeeklyHours). */
export async function saveWeeklyHours(installerId: string, hours: WeeklyHours): Promise<void> {
	await db.transaction(async (tx) => {
		await tx.delete(installerHours).where(eq(installerHours.installerId, installerId));
		if (hours.length === 0) return;
		await tx.insert(installerHours).values(
			hours.map((h) => ({
				installerId,
				weekday: h.weekday,
				startMinute: toMinute(h.start),
				endMinute: toMinute(h.end)
			}))
		);
	});
}

/** Local dates the installer does not work, soonest first. */
export async function listBlockedDates(installerId: string) {
	return db
		.select({ day: installerBlockedDate.day, note: installerBlockedDate.note })
		.from(installerBlockedDate)
		.where(eq(installerBlockedDate.installerId, installerId))
		.orderBy(asc(installerBlockedDate.day));
}

/** The day after a calendar date 'YYYY-MM-DD'. */
const nextDay = (day: string) =>
	new Date(Date.parse(`${day}T00:00:00Z`) + 86_400_000).toISOString().slice(0, 10);

/**
 * Blocks a local date (a second block of the same date just updates its note). A date with a
 * fit booked on it (confirmed, or provisional with its hold running at `now`) is refused: a day
 * off would not move the fit, only hide that the installer is expected there.
 * @param zone the installer's zone, which says where the date starts and ends
 */
export async function blockDate(
	installerId: string,
	day: string,
	note: string | null,
	zone: string,
	now = new Date()
): Promise<{ ok: true } | Refusal> {
	const [booked] = await db
		.select({ start: booking.slotStart })
		.from(booking)
		.where(
			and(
				eq(booking.installerId, installerId),
				lt(booking.slotStart, localToUtc(nextDay(day), '00:00', zone)),
				gt(booking.slotEnd, localToUtc(day, '00:00', zone)),
				or(
					eq(booking.status, 'confirmed'),
					and(eq(booking.status, 'awaiting_payment'), gt(booking.holdExpiresAt, now))
				)
			)
		)
		.orderBy(asc(booking.slotStart))
		.limit(1);
	if (booked) {
		return refuse(
			409,
			`You have a fit booked on ${formatDay(day)} at ${formatInZone(booked.start, zone, 'h:mm a').toLowerCase()}. Keep the day open, or ask the owner about another time in the job's messages first.`,
			{ fields: { day: 'A fit is booked on this day.' } }
		);
	}
	await db
		.insert(installerBlockedDate)
		.values({ installerId, day, note })
		.onConflictDoUpdate({
			target: [installerBlockedDate.installerId, installerBlockedDate.day],
			set: { note }
		});
	return { ok: true };
}

/** Unblocks a local date. */
export async function unblockDate(installerId: string, day: string) {
	await db
		.delete(installerBlockedDate)
		.where(
			and(eq(installerBlockedDate.installerId, installerId), eq(installerBlockedDate.day, day))
		);
}

/**
 * The installer's weekly hours, days off and live bookings, for checking slots. The queries run
 * one after another: inside a transaction they share one connection, which takes one query at a
 * time.
 */
export async function loadDiary(installerId: string, now: Date, tx: Tx | typeof db = db) {
	const hours = await getWeeklyHours(installerId, tx);
	const blocked = await tx
		.select({ day: installerBlockedDate.day })
		.from(installerBlockedDate)
		.where(eq(installerBlockedDate.installerId, installerId));
	const bookings = await tx
		.select({ start: booking.slotStart, end: booking.slotEnd })
		.from(booking)
		.where(
			and(
				eq(booking.installerId, installerId),
				or(
					eq(booking.status, 'confirmed'),
					and(eq(booking.status, 'awaiting_payment'), gt(booking.holdExpiresAt, now))
				)
			)
		);
	return { hours, blocked: blocked.map((b) => b.day), bookings };
}

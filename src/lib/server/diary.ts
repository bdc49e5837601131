/** Installers' diaries: weekly hours, days off, and the bookings that take their time. */
import { and, asc, eq, gt, or } from 'drizzle-orm';
import type { Weekday, WeeklyHours } from '$lib/schedule';
import { db, type Tx } from './db';
import { booking, installerBlockedDate, installerHours } from './db/schema';

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

/** Blocks a local date (a second block of the same date just updates its note). */
export async function blockDate(installerId: string, day: string, note: string | null) {
	await db
		.insert(installerBlockedDate)
		.values({ installerId, day, note })
		.onConflictDoUpdate({
			target: [installerBlockedDate.installerId, installerBlockedDate.day],
			set: { note }
		});
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

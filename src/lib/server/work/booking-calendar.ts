/**
 * A booking in calendars: its .ics file for either side ({@link getBookingCalendarFile}), the
 * installer's week ({@link getInstallerWeek}) and where the fit happens as each side reads it
 * ({@link fitPlace}).
 */
import { and, asc, eq, gt, gte, lt, or } from 'drizzle-orm';
import { bookingCalendarFile } from '$lib/work/booking-ics';
import { addCalendarDays, buildWeek, weekFromParam, type WeekDay } from '$lib/work/calendar-week';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { localToUtc } from '$lib/time';
import { db } from '../db';
import { booking, installerBlockedDate, installerProfile, job, payment, user } from '../db/schema';
import { getWeeklyHours } from './diary';
import { appUrl } from '../mail/app-url';
import { bookingPath, type Party } from './rescheduling';
import { refuse, type Refusal } from '../refusal';

export interface PlaceFacts {
	locationMode: 'mobile' | 'workshop' | null;
	addressLine: string | null;
	suburb: string | null;
	postcode: string | null;
	workshopAddress: string | null;
	installerSuburb: string;
}

/**
 * Where the fit happens, for a paid booking: the owner's address for a mobile fit (the installer
 * sees it once paid; the owner knows it anyway), the installer's workshop for a workshop fit.
 */
export function fitPlace(p: PlaceFacts): string {
	if (p.locationMode === 'workshop') {
		return p.workshopAddress ?? `The installer's workshop, ${p.installerSuburb}`;
	}
	const line = p.addressLine?.trim() ?? '';
	const area = [p.suburb, p.postcode].filter(Boolean).join(' ');
	if (!line) return area || 'Address not given';
	// Many owners type the suburb into the street line already: add only what is missing.
	if (p.suburb && line.toLowerCase().includes(p.suburb.toLowerCase())) {
		return p.postcode && !line.includes(p.postcode) ? `${line} ${p.postcode}` : line;
	}
	return area ? `${line}, ${area}` : line;
}

const placeColumns = {
	locationMode: job.locationMode,
	addressLine: job.addressLine,
	suburb: job.suburb,
	postcode: job.postcode,
	workshopAddress: installerProfile.workshopAddress,
	installerSuburb: installerProfile.suburb
};

/**
 * The .ics file of a booking for one of its sides: 404 for anyone else's booking, 409 until it
 * is paid (the address is not the installer's to see before then). A booking cancelled after it
 * was paid gets the file that takes the event out of calendars.
 */
export async function getBookingCalendarFile(
	bookingId: string,
	who: Party
): Promise<{ ok: true; ics: string } | Refusal> {
	const [row] = await db
		.select({
			...placeColumns,
			id: booking.id,
			jobId: booking.jobId,
			ownerId: booking.ownerId,
			installerId: booking.installerId,
			status: booking.status,
			slotStart: booking.slotStart,
			slotEnd: booking.slotEnd,
			sequence: booking.calendarSequence,
			title: job.title,
			businessName: installerProfile.businessName,
			ownerName: user.displayName,
			paidAt: payment.paidAt
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
		.innerJoin(user, eq(user.id, booking.ownerId))
		.leftJoin(payment, eq(payment.bookingId, booking.id))
		.where(eq(booking.id, bookingId));
	if (!row || (who.side === 'owner' ? row.ownerId : row.installerId) !== who.id) {
		return refuse(404, 'There is no such booking among yours.');
	}
	const cancelled = row.status === 'cancelled' && row.paidAt !== null;
	if (row.status !== 'confirmed' && !cancelled) {
		return refuse(409, 'The calendar file is ready once the booking is paid.');
	}
	const title = titleOrUntitled(row.title);
	const other = who.side === 'owner' ? row.businessName : row.ownerName;
	return {
		ok: true,
		ics: bookingCalendarFile({
			bookingId: row.id,
			start: row.slotStart,
			end: row.slotEnd,
			title: `Dash cam fit: ${title}`,
			location: fitPlace(row),
			description: `${title} with ${other}, booked on Tapline.`,
			url: appUrl(bookingPath(who.side, row)),
			sequence: row.sequence,
			cancelled
		})
	};
}

/**
 * The installer's week holding the date `weekParam` asks for (this week in their zone when it
 * asks for none): hours, days off and bookings that start in it, confirmed or provisional with
 * the hold still running at `now`. Null when the installer has no profile yet.
 */
export async function getInstallerWeek(
	installerId: string,
	weekParam: string | null,
	now: Date
): Promise<{ monday: string; zone: string; days: WeekDay[] } | null> {
	const [profile] = await db
		.select({ zone: installerProfile.timeZone })
		.from(installerProfile)
		.where(eq(installerProfile.userId, installerId));
	if (!profile) return null;
	const zone = profile.zone;
	const monday = weekFromParam(weekParam, now, zone);
	const from = localToUtc(monday, '00:00', zone);
	const to = localToUtc(addCalendarDays(monday, 7), '00:00', zone);
	const hours = await getWeeklyHours(installerId);
	const blocked = await db
		.select({ day: installerBlockedDate.day })
		.from(installerBlockedDate)
		.where(
			and(
				eq(installerBlockedDate.installerId, installerId),
				gte(installerBlockedDate.day, monday),
				lt(installerBlockedDate.day, addCalendarDays(monday, 7))
			)
		);
	const rows = await db
		.select({
			id: booking.id,
			jobId: booking.jobId,
			start: booking.slotStart,
			end: booking.slotEnd,
			title: job.title,
			suburb: job.suburb,
			status: booking.status
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.where(
			and(
				eq(booking.installerId, installerId),
				gte(booking.slotStart, from),
				lt(booking.slotStart, to),
				or(
					eq(booking.status, 'confirmed'),
					and(eq(booking.status, 'awaiting_payment'), gt(booking.holdExpiresAt, now))
				)
			)
		)
		.orderBy(asc(booking.slotStart));
	const days = buildWeek({
		monday,
		hours,
		blocked: blocked.map((b) => b.day),
		bookings: rows.map((r) => ({
			...r,
			title: titleOrUntitled(r.title),
			status: r.status === 'confirmed' ? 'confirmed' : 'awaiting_payment'
		})),
		zone,
		now
	});
	return { monday, zone, days };
}

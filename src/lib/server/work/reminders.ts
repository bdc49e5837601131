/**
 * The e-mail a day before a fit, to both sides: the `booking-reminder` schedule runs
 * {@link sendDueReminders} every 10 minutes. A booking is due once its slot starts within
 * {@link REMINDER_HOURS} hours; each is locked with SKIP LOCKED, re-read, marked
 * (`booking.reminder_sent_at`) and its two e-mails written to the outbox in one transaction, so
 * two workers or a retry send each reminder once. A new time clears the mark (see
 * rescheduling.ts), so a moved booking is reminded of its new slot.
 */
import { and, asc, eq, gt, isNull, lte } from 'drizzle-orm';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { formatSlotLabel } from '$lib/work/schedule';
import { db } from '../db';
import { booking, installerProfile, job, user } from '../db/schema';
import { fitPlace } from './booking-calendar';
import { appUrl } from '../mail/app-url';
import { withMail } from '../mail/outbox';
import { bookingPath } from './rescheduling';

/** How long before the slot the reminder goes (Tapline's choice: "a day before"). */
export const REMINDER_HOURS = 24;

const dueWhere = (now: Date) =>
	and(
		eq(booking.status, 'confirmed'),
		eq(booking.stage, 'to_fit'),
		isNull(booking.reminderSentAt),
		gt(booking.slotStart, now),
		lte(booking.slotStart, new Date(now.getTime() + REMINDER_HOURS * 3_600_000))
	);

/**
 * Sends the reminders now due.
 * @returns the ids of the bookings this call reminded
 */
export async function sendDueReminders(now = new Date()): Promise<string[]> {
	const due = await db
		.select({ id: booking.id })
		.from(booking)
		.where(dueWhere(now))
		.orderBy(asc(booking.slotStart))
		.limit(200);
	const sent: string[] = [];
	for (const { id } of due) {
		const done = await withMail(async (tx, mail) => {
			const [free] = await tx
				.select({ id: booking.id })
				.from(booking)
				.where(and(eq(booking.id, id), dueWhere(now)))
				.for('update', { skipLocked: true });
			if (!free) return false;
			const [row] = await tx
				.select({
					id: booking.id,
					jobId: booking.jobId,
					start: booking.slotStart,
					end: booking.slotEnd,
					title: job.title,
					timeZone: job.timeZone,
					locationMode: job.locationMode,
					addressLine: job.addressLine,
					suburb: job.suburb,
					postcode: job.postcode,
					workshopAddress: installerProfile.workshopAddress,
					installerSuburb: installerProfile.suburb,
					businessName: installerProfile.businessName,
					ownerEmail: user.email,
					ownerName: user.displayName
				})
				.from(booking)
				.innerJoin(job, eq(job.id, booking.jobId))
				.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
				.innerJoin(user, eq(user.id, booking.ownerId))
				.where(eq(booking.id, id));
			if (!row) return false;
			const [installer] = await tx
				.select({ email: user.email })
				.from(booking)
				.innerJoin(user, eq(user.id, booking.installerId))
				.where(eq(booking.id, id));
			if (!installer) return false;
			await tx.update(booking).set({ reminderSentAt: now }).where(eq(booking.id, id));
			const title = titleOrUntitled(row.title);
			const slot = formatSlotLabel({ start: row.start, end: row.end }, row.timeZone, now);
			const where = fitPlace(row);
			await mail.send(row.ownerEmail, {
				template: 'booking-reminder',
				data: {
					greeting: `Hi ${row.ownerName}`,
					title,
					slot: `${slot} with ${row.businessName}`,
					where,
					url: appUrl(bookingPath('owner', row))
				}
			});
			await mail.send(installer.email, {
				template: 'booking-reminder',
				data: {
					greeting: `Hi ${row.businessName}`,
					title,
					slot: `${slot} for ${row.ownerName}`,
					where,
					url: appUrl(bookingPath('installer', row))
				}
			});
			return true;
		});
		if (done) sent.push(id);
	}
	return sent;
}

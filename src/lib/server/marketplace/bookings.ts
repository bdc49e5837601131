/**
 * Booking one quote. In one transaction: lock the job row, check it still collects quotes and
 * the quote is live, insert a provisional booking holding the slot, mark the job booked, accept
 * the quote, decline the others and queue a polite e-mail to each. Two tabs booking at once are
 * served one after the other by the row lock (the second finds the job booked); two jobs taking
 * the same installer's time meet the exclusion constraint of migration 0002, and the loser gets a
 * 409 with a clear message. Holds that run out lapse, and the slot and the job open again.
 */
import { and, eq, gt, inArray, lte, ne, or, type SQL } from 'drizzle-orm';
import { formatSlotLabel } from '$lib/work/schedule';
import { formatDayTime } from '$lib/time';
import { unconfirmedEmail } from '../people/confirmed-email';
import { db, type Tx } from '../db';
import { booking, installerProfile, job, quote, user } from '../db/schema';
import { appUrl } from '../mail/app-url';
import { withMail, type Mail } from '../mail/outbox';
import { refuse, type Refusal } from '../refusal';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { canQuote } from '$lib/people/vetting';
import { INSTALLER_ON_HOLD_TEXT } from '$lib/labels';

/** How long a provisional booking holds the installer's slot while the owner pays (Tapline's choice). */
export const HOLD_MINUTES = 30;

export type BookingOutcome = { ok: true; bookingId: string } | Refusal;

/** The PostgreSQL error code of a failed query, looking through Drizzle's wrapper. */
function pgCode(err: unknown): string | undefined {
	let current: unknown = err;
	for (let depth = 0; current && depth < 5; depth++) {
		const code = (current as { code?: unknown }).code;
		if (typeof code === 'string' && /^[0-9A-Z]{5}$/.test(code)) return code;
		current = (current as { cause?: unknown }).cause;
	}
	return undefined;
}

/**
 * Books a quote at one of its slots for the job's owner; the booking waits for payment and holds
 * the slot for {@link HOLD_MINUTES} minutes.
 * @param slotStart the chosen slot's start, as the ISO string stored on the quote
 */
export async function bookQuote(
	ownerId: string,
	jobId: string,
	quoteId: string,
	slotStart: string,
	now = new Date()
): Promise<BookingOutcome> {
	try {
		return await withMail(async (tx, mail) => {
			// The installer's standing is read under a share lock taken before the job's lock, in
			// the order quoting and vetting decisions lock (profile, then job, then quote): a
			// suspension or pause in progress finishes first, and one arriving later waits for
			// this booking, which it then sees and handles.
			const [owner] = await tx
				.select({ installerId: quote.installerId })
				.from(quote)
				.innerJoin(job, and(eq(job.id, quote.jobId), eq(job.ownerId, ownerId)))
				.where(and(eq(quote.id, quoteId), eq(quote.jobId, jobId)));
			if (!owner) return refuse(404, 'There is no such quote on your jobs.');
			const [standing] = await tx
				.select({
					vettingStatus: installerProfile.vettingStatus,
					pausedReason: installerProfile.pausedReason
				})
				.from(installerProfile)
				.where(eq(installerProfile.userId, owner.installerId))
				.for('share');
			if (!standing || !canQuote(standing)) return refuse(409, INSTALLER_ON_HOLD_TEXT);
			const [locked] = await tx
				.select()
				.from(job)
				.where(and(eq(job.id, jobId), eq(job.ownerId, ownerId)))
				.for('update');
			if (!locked) return refuse(404, 'There is no such quote on your jobs.');
			const unconfirmed = await unconfirmedEmail(tx, ownerId);
			if (unconfirmed) return unconfirmed;
			// An expired hold on this very job must not keep it booked.
			const lapsedHere = await lapseHolds(tx, mail, eq(booking.jobId, jobId), now);
			const status = lapsedHere > 0 ? 'collecting_quotes' : locked.status;
			if (status === 'booked') {
				return refuse(
					409,
					'This job is already booked (perhaps from another tab); see its booking.'
				);
			}
			if (status !== 'collecting_quotes') {
				return refuse(409, 'This job is not taking bookings any more.');
			}
			const [chosen] = await tx
				.select({
					quote,
					businessName: installerProfile.businessName,
					timeZone: installerProfile.timeZone,
					email: user.email
				})
				.from(quote)
				.innerJoin(installerProfile, eq(installerProfile.userId, quote.installerId))
				.innerJoin(user, eq(user.id, quote.installerId))
				.where(and(eq(quote.id, quoteId), eq(quote.jobId, jobId)))
				.for('update', { of: quote });
			if (!chosen) return refuse(404, 'There is no such quote on your jobs.');
			if (chosen.quote.status !== 'live') {
				return refuse(
					409,
					'This quote is no longer open: the installer withdrew it or it ran out.'
				);
			}
			if (chosen.quote.expiresAt && chosen.quote.expiresAt.getTime() <= now.getTime()) {
				return refuse(409, 'This quote has expired; ask the installer for a fresh one.');
			}
			const slot = chosen.quote.slots.find((s) => s.start === slotStart);
			if (!slot) return refuse(400, 'Choose one of the times the installer offered.');
			if (new Date(slot.start).getTime() <= now.getTime()) {
				return refuse(409, 'That time has passed; choose another.');
			}
			// Free the installer's own expired holds, so a lapsed hold never blocks a real booking.
			await lapseHolds(tx, mail, eq(booking.installerId, chosen.quote.installerId), now);
			const holdExpiresAt = new Date(now.getTime() + HOLD_MINUTES * 60_000);
			const [made] = await tx
				.insert(booking)
				.values({
					jobId,
					quoteId,
					installerId: chosen.quote.installerId,
					ownerId,
					slotStart: new Date(slot.start),
					slotEnd: new Date(slot.end),
					holdExpiresAt,
					totalCents: chosen.quote.totalCents,
					createdAt: now
				})
				.returning({ id: booking.id });
			if (!made) throw new Error('Booking insert returned no row');
			await tx.update(job).set({ status: 'booked', updatedAt: now }).where(eq(job.id, jobId));
			await tx
				.update(quote)
				.set({ status: 'accepted', updatedAt: now })
				.where(eq(quote.id, quoteId));
			const declined = await tx
				.update(quote)
				.set({ status: 'declined', updatedAt: now })
				.where(and(eq(quote.jobId, jobId), ne(quote.id, quoteId), eq(quote.status, 'live')))
				.returning({ installerId: quote.installerId });
			const title = titleOrUntitled(locked.title);
			if (declined.length > 0) {
				const people = await tx
					.select({ email: user.email, businessName: installerProfile.businessName })
					.from(installerProfile)
					.innerJoin(user, eq(user.id, installerProfile.userId))
					.where(
						inArray(
							installerProfile.userId,
							declined.map((d) => d.installerId)
						)
					);
				for (const person of people) {
					await mail.send(person.email, {
						template: 'quote-declined',
						data: { businessName: person.businessName, title, url: appUrl('/installer/jobs') }
					});
				}
			}
			await mail.send(chosen.email, {
				template: 'booking-provisional',
				data: {
					businessName: chosen.businessName,
					title,
					slot: formatSlotLabel(slot, chosen.timeZone, now),
					holdUntil: formatDayTime(holdExpiresAt, chosen.timeZone, now),
					url: appUrl(`/installer/jobs/${jobId}`)
				}
			});
			const [ownerPerson] = await tx
				.select({ email: user.email, displayName: user.displayName })
				.from(user)
				.where(eq(user.id, ownerId));
			if (ownerPerson) {
				await mail.send(ownerPerson.email, {
					template: 'booking-started',
					data: {
						displayName: ownerPerson.displayName,
						businessName: chosen.businessName,
						title,
						slot: formatSlotLabel(slot, locked.timeZone, now),
						holdUntil: formatDayTime(holdExpiresAt, locked.timeZone, now),
						url: appUrl(`/owner/bookings/${made.id}`)
					}
				});
			}
			return { ok: true, bookingId: made.id };
		});
	} catch (err) {
		const code = pgCode(err);
		if (code === '23P01') {
			return refuse(
				409,
				'The installer was booked for an overlapping time on another job a moment ago. Choose another time.'
			);
		}
		if (code === '23505') {
			return refuse(
				409,
				'This job was booked a moment ago, perhaps from another tab; see its booking.'
			);
		}
		throw err;
	}
}

/**
 * Lapses provisional bookings whose hold ran out (within `scope`): the booking becomes
 * 'lapsed' (which frees the slot: the exclusion constraint only counts live bookings), the job
 * collects quotes again and the accepted quote is live again. Quotes declined at booking stay
 * declined; those installers may send a fresh revision.
 * E-mails each installer whose slot was freed, and the owner whose hold ran out.
 * @returns how many bookings lapsed
 */
export async function lapseHolds(
	tx: Tx,
	mail: Mail,
	scope: SQL | undefined,
	now: Date
): Promise<number> {
	const lapsed = await tx
		.update(booking)
		.set({ status: 'lapsed' })
		.where(and(eq(booking.status, 'awaiting_payment'), lte(booking.holdExpiresAt, now), scope))
		.returning({
			jobId: booking.jobId,
			quoteId: booking.quoteId,
			installerId: booking.installerId,
			ownerId: booking.ownerId,
			slotStart: booking.slotStart,
			slotEnd: booking.slotEnd
		});
	for (const b of lapsed) {
		const [j] = await tx
			.update(job)
			.set({ status: 'collecting_quotes', updatedAt: now })
			.where(and(eq(job.id, b.jobId), eq(job.status, 'booked')))
			.returning({ title: job.title, timeZone: job.timeZone });
		await tx
			.update(quote)
			.set({ status: 'live', updatedAt: now })
			.where(and(eq(quote.id, b.quoteId), eq(quote.status, 'accepted')));
		const [person] = await tx
			.select({
				email: user.email,
				businessName: installerProfile.businessName,
				timeZone: installerProfile.timeZone
			})
			.from(installerProfile)
			.innerJoin(user, eq(user.id, installerProfile.userId))
			.where(eq(installerProfile.userId, b.installerId));
		const slot = { start: b.slotStart, end: b.slotEnd };
		if (person) {
			await mail.send(person.email, {
				template: 'booking-lapsed',
				data: {
					businessName: person.businessName,
					title: titleOrUntitled(j?.title),
					slot: formatSlotLabel(slot, person.timeZone, now)
				}
			});
		}
		const [ownerPerson] = await tx
			.select({ email: user.email, displayName: user.displayName, timeZone: job.timeZone })
			.from(user)
			.innerJoin(job, eq(job.id, b.jobId))
			.where(eq(user.id, b.ownerId));
		if (ownerPerson && person) {
			await mail.send(ownerPerson.email, {
				template: 'booking-lapsed-owner',
				data: {
					displayName: ownerPerson.displayName,
					businessName: person.businessName,
					title: titleOrUntitled(j?.title),
					slot: formatSlotLabel(slot, ownerPerson.timeZone, now),
					url: appUrl(`/owner/jobs/${b.jobId}/quotes`)
				}
			});
		}
	}
	return lapsed.length;
}

/**
 * Lapses every expired hold, or only one job's.
 * @returns how many bookings lapsed
 */
export function lapseExpiredHolds(options: { jobId?: string } = {}, now = new Date()) {
	return withMail((tx, mail) =>
		lapseHolds(tx, mail, options.jobId ? eq(booking.jobId, options.jobId) : undefined, now)
	);
}

/**
 * Confirms a provisional booking once its payment has been taken into held funds. The payment
 * step (a later issue) calls this; nothing else does. Refuses a booking whose hold ran out.
 */
export async function confirmBooking(bookingId: string, now = new Date()) {
	return db.transaction(async (tx) => {
		const [row] = await tx.select().from(booking).where(eq(booking.id, bookingId)).for('update');
		if (!row) return refuse(404, 'There is no such booking.');
		if (row.status !== 'awaiting_payment' || row.holdExpiresAt.getTime() <= now.getTime()) {
			return refuse(409, 'This booking is no longer waiting for payment.');
		}
		await tx.update(booking).set({ status: 'confirmed' }).where(eq(booking.id, bookingId));
		return { ok: true as const };
	});
}

/** A booking of the owner's with its job, quote and installer; null when it is not theirs. */
export async function getOwnerBooking(bookingId: string, ownerId: string) {
	const [row] = await db
		.select({
			booking,
			title: job.title,
			jobId: job.id,
			businessName: installerProfile.businessName,
			suburb: installerProfile.suburb,
			timeZone: job.timeZone,
			gstRegistered: quote.gstRegistered,
			gstCents: quote.gstCents
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(quote, eq(quote.id, booking.quoteId))
		.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
		.where(and(eq(booking.id, bookingId), eq(booking.ownerId, ownerId)));
	return row ?? null;
}

/**
 * The live booking of a job at `now`, if any: confirmed, or provisional with its hold still
 * running (a hold that ran out reads as gone before the schedule lapses it).
 */
export async function getLiveBookingForJob(jobId: string, now = new Date()) {
	const [row] = await db
		.select({ id: booking.id, installerId: booking.installerId, status: booking.status })
		.from(booking)
		.where(
			and(
				eq(booking.jobId, jobId),
				or(
					eq(booking.status, 'confirmed'),
					and(eq(booking.status, 'awaiting_payment'), gt(booking.holdExpiresAt, now))
				)
			)
		);
	return row ?? null;
}

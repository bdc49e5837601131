/**
 * Finishing a paid booking: the fit report opens the owner's confirmation window
 * ({@link openConfirmationWindow}, called in the report's own transaction); the owner confirms
 * ({@link confirmWork}) or, when the window closes without an answer, the `booking-auto-confirm`
 * schedule does ({@link confirmOverdueWork}). Either way the same transaction marks the release
 * as asked for, and {@link releaseHeldFunds} pays the installer after commit; a release the
 * provider did not take is retried by the `held-funds-release` schedule, so a crash between the
 * two loses nothing. Every move is checked against $lib/work/lifecycle under the booking's row lock,
 * so two workers or a double click confirm once.
 */
import { and, eq, lte, sql } from 'drizzle-orm';
import { confirmationDeadline, nextStage, type FitActor, type FitMove } from '$lib/work/lifecycle';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { formatDayTime } from '$lib/time';
import { db, type Tx } from '../db';
import { booking, installerProfile, job, notice, payment, user } from '../db/schema';
import { appUrl } from '../mail/app-url';
import { withMail, type Mail } from '../mail/outbox';
import { releaseHeldFunds, type ReleaseOutcome } from '../money/payments';
import { refuse, type Refusal } from '../refusal';
import { getMarketSettings } from '../money/settings';

/** The booking with its people, locked for update (null when there is none). */
export async function lockFitBooking(tx: Tx, bookingId: string) {
	const [row] = await tx
		.select({
			booking,
			title: job.title,
			timeZone: job.timeZone,
			ownerEmail: user.email,
			ownerName: user.displayName,
			paidAt: payment.paidAt
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(user, eq(user.id, booking.ownerId))
		.leftJoin(payment, eq(payment.bookingId, booking.id))
		.where(eq(booking.id, bookingId))
		.for('update', { of: booking });
	return row ?? null;
}

type Locked = NonNullable<Awaited<ReturnType<typeof lockFitBooking>>>;

/** Refuses a move the lifecycle does not allow, or a booking that is not paid and confirmed. */
export function checkMove(row: Locked, move: FitMove, actor: FitActor, now: Date) {
	if (row.booking.status !== 'confirmed' || !row.paidAt) {
		return refuse(409, 'This booking is not paid and confirmed, so its work cannot move on.');
	}
	const check = nextStage(row.booking.stage, move, actor, now, row.booking.confirmBy);
	return check.ok ? check : refuse(409, check.message);
}

async function installerContact(tx: Tx, installerId: string) {
	const [row] = await tx
		.select({ email: user.email, businessName: installerProfile.businessName })
		.from(installerProfile)
		.innerJoin(user, eq(user.id, installerProfile.userId))
		.where(eq(installerProfile.userId, installerId));
	if (!row) throw new Error(`installer ${installerId} missing`);
	return row;
}

/**
 * Moves a locked booking from 'to fit' to 'reported' and opens the owner's confirmation window
 * (the market setting's hours from `now`), with the owner's e-mail and notice. For the fit report
 * to call in its own transaction, after checking the installer is the booking's.
 * @returns the deadline, or a refusal when the booking cannot take a report now
 */
export async function openConfirmationWindow(
	tx: Tx,
	mail: Mail,
	bookingId: string,
	now = new Date()
): Promise<{ ok: true; confirmBy: Date } | Refusal> {
	const row = await lockFitBooking(tx, bookingId);
	if (!row) return refuse(404, 'There is no such booking.');
	const check = checkMove(row, 'file-report', 'installer', now);
	if (!check.ok) return check;
	const { confirmationWindowHours } = await getMarketSettings(tx);
	const confirmBy = confirmationDeadline(now, confirmationWindowHours);
	await tx
		.update(booking)
		.set({ stage: check.to, reportedAt: now, confirmBy })
		.where(eq(booking.id, bookingId));
	const installer = await installerContact(tx, row.booking.installerId);
	const title = titleOrUntitled(row.title);
	const deadline = formatDayTime(confirmBy, row.timeZone, now);
	await mail.send(row.ownerEmail, {
		template: 'fit-reported-owner',
		data: {
			displayName: row.ownerName,
			title,
			businessName: installer.businessName,
			confirmBy: deadline,
			url: appUrl(`/owner/bookings/${bookingId}`)
		}
	});
	await tx.insert(notice).values({
		userId: row.booking.ownerId,
		text: `Fitted: the ${title}. Confirm the work or raise a problem by ${deadline}.`,
		link: `/owner/bookings/${bookingId}`
	});
	return { ok: true, confirmBy };
}

export type ConfirmOutcome = { ok: true; release: ReleaseOutcome } | Refusal;

/** Accepts the work in the caller's transaction and asks for the release. */
async function accept(
	tx: Tx,
	mail: Mail,
	row: Locked,
	by: 'owner' | 'window',
	now: Date
): Promise<void> {
	const b = row.booking;
	await tx
		.update(booking)
		.set({ stage: 'accepted', acceptedAt: now, acceptedBy: by })
		.where(eq(booking.id, b.id));
	await tx
		.update(payment)
		.set({ releaseRequestedAt: sql`coalesce(${payment.releaseRequestedAt}, ${now})` })
		.where(eq(payment.bookingId, b.id));
	const installer = await installerContact(tx, b.installerId);
	const title = titleOrUntitled(row.title);
	const why =
		by === 'owner'
			? `${row.ownerName} confirmed the work.`
			: 'The confirmation window closed without a problem raised, so the work counts as confirmed.';
	await mail.send(installer.email, {
		template: 'work-confirmed',
		data: {
			greeting: `${installer.businessName}, the ${title} is confirmed`,
			title,
			lines: [why, 'The held funds are being paid to you; the payout statement follows.'],
			url: appUrl(`/installer/payouts/${b.id}`)
		}
	});
	if (by === 'window') {
		await mail.send(row.ownerEmail, {
			template: 'work-confirmed',
			data: {
				greeting: `Hi ${row.ownerName}, the ${title} is confirmed`,
				title,
				lines: [
					'The time to raise a problem has passed, so the work counts as confirmed and the held funds go to the installer.',
					'Your install record stays on the booking page. You can now review the installer.'
				],
				url: appUrl(`/owner/bookings/${b.id}`)
			}
		});
	}
	await tx.insert(notice).values({
		userId: b.installerId,
		text: `Confirmed: the ${title}. ${why}`,
		link: `/installer/payouts/${b.id}`
	});
}

/**
 * The owner confirms the work inside the window; the held funds are then released. A second call
 * is refused (the stage has moved on), so a double click pays once.
 */
export async function confirmWork(
	bookingId: string,
	ownerId: string,
	now = new Date()
): Promise<ConfirmOutcome> {
	const accepted = await withMail(async (tx, mail) => {
		const row = await lockFitBooking(tx, bookingId);
		if (!row || row.booking.ownerId !== ownerId) {
			return refuse(404, 'There is no such booking among yours.');
		}
		const check = checkMove(row, 'confirm', 'owner', now);
		if (!check.ok) return check;
		await accept(tx, mail, row, 'owner', now);
		return { ok: true as const };
	});
	if (!accepted.ok) return accepted;
	return { ok: true, release: await releaseHeldFunds(bookingId, now) };
}

/**
 * Confirms every booking whose window has closed with no answer, and releases its funds: the
 * `booking-auto-confirm` schedule's job. Each booking is locked with SKIP LOCKED and re-checked, so
 * two workers running at once confirm each booking once; a crash after the commit leaves the
 * release asked for, which the release schedule completes.
 * @returns the ids confirmed by this call
 */
export async function confirmOverdueWork(now = new Date()): Promise<string[]> {
	const due = await db
		.select({ id: booking.id })
		.from(booking)
		.where(and(eq(booking.stage, 'reported'), lte(booking.confirmBy, now)))
		.orderBy(booking.confirmBy)
		.limit(200);
	const confirmed: string[] = [];
	for (const { id } of due) {
		const done = await withMail(async (tx, mail) => {
			const [free] = await tx
				.select({ id: booking.id })
				.from(booking)
				.where(eq(booking.id, id))
				.for('update', { skipLocked: true });
			if (!free) return false;
			const row = await lockFitBooking(tx, id);
			if (!row) return false;
			const check = checkMove(row, 'window-closes', 'schedule', now);
			if (!check.ok) return false;
			await accept(tx, mail, row, 'window', now);
			return true;
		});
		if (done) {
			confirmed.push(id);
			await releaseHeldFunds(id, now);
		}
	}
	return confirmed;
}

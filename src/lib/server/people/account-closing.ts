/**
 * Closing an account. The `user` row stays, because bookings, quotes, thread messages and the
 * append-only vetting trail point at it; its personal fields are overwritten instead (name,
 * address, password) and `deleted_at` is set, so nobody can sign in to it or reach it again.
 * What happens to the person's work is said on the account page before they confirm:
 * - owner: jobs open for quotes are withdrawn, drafts are removed (with their photos), street
 *   addresses are cleared; a job with a booking in progress stops the closing;
 * - installer: live quotes are withdrawn (each owner is told), quoting is paused for good, contact
 *   details, photo ID and gallery photos go; the vetting record and insurance papers stay for the
 *   record; a booking in progress stops the closing;
 * - admin: the last admin cannot close their account.
 * Everything happens in one transaction, with every session ended in it.
 */
import { and, eq, gt, inArray, isNull, or, sql } from 'drizzle-orm';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { endSessionsExcept } from '../auth';
import { lapseHolds } from '../marketplace/bookings';
import { db, type Tx } from '../db';
import {
	booking,
	emailToken,
	installerDocument,
	installerProfile,
	job,
	jobPhoto,
	quote,
	user,
	type Role
} from '../db/schema';
import { deleteObject } from '../files/storage';
import { withMail, type Mail } from '../mail/outbox';
import { checkCurrentPassword } from './account-settings';
import { refuse, type Refusal } from '../refusal';
import { lockProfile, recordEvent, withdrawLiveQuotes } from './vetting';

/** The name a closed account shows wherever its past messages or bookings are listed. */
export const CLOSED_ACCOUNT_NAME = 'Closed account';
/** Why a closed installer's quoting is paused (never lifted: decisions refuse closed accounts). */
export const CLOSED_INSTALLER_PAUSE = 'The installer closed their account.';
/** The reason stored on an owner's jobs withdrawn by the closing. */
export const CLOSED_OWNER_WITHDRAWAL = 'The owner closed their account.';

export const LAST_ADMIN =
	'You are the only admin, so this account cannot be closed. Invite another admin on the Admin team page first.';

const bookingInProgress = (title: string) =>
	`The job “${title}” has a booking in progress, so the account cannot be closed yet. An unpaid booking lets go when its hold runs out; a paid one stays until the fit is done.`;

/** Thrown inside the transaction to roll it back with a refusal. */
class Refused extends Error {
	constructor(readonly refusal: Refusal) {
		super(refusal.message);
	}
}

/** Bookings of this person that still hold a job: paid, or unpaid with the hold running. */
function activeBookingsOf(tx: Tx | typeof db, userId: string, now: Date) {
	return tx
		.select({ title: job.title, slotStart: booking.slotStart })
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.where(
			and(
				or(eq(booking.ownerId, userId), eq(booking.installerId, userId)),
				eq(job.status, 'booked'),
				or(
					eq(booking.status, 'confirmed'),
					and(eq(booking.status, 'awaiting_payment'), gt(booking.holdExpiresAt, now))
				)
			)
		);
}

/** What closing the account would do now, for the account page (reads only). */
export async function previewAccountClosing(userId: string, role: Role, now = new Date()) {
	const [jobs, liveQuotes, active, admins] = [
		role === 'owner'
			? await db
					.select({ status: job.status })
					.from(job)
					.where(
						and(eq(job.ownerId, userId), inArray(job.status, ['drafting', 'collecting_quotes']))
					)
			: [],
		role === 'installer'
			? await db
					.select({ id: quote.id })
					.from(quote)
					.where(and(eq(quote.installerId, userId), eq(quote.status, 'live')))
			: [],
		await activeBookingsOf(db, userId, now),
		role === 'admin'
			? await db
					.select({ id: user.id })
					.from(user)
					.where(and(eq(user.role, 'admin'), isNull(user.deletedAt), isNull(user.suspendedAt)))
			: []
	];
	return {
		openJobs: jobs.filter((j) => j.status === 'collecting_quotes').length,
		drafts: jobs.filter((j) => j.status === 'drafting').length,
		liveQuotes: liveQuotes.length,
		activeBookings: active.map((b) => ({
			title: titleOrUntitled(b.title),
			slotStart: b.slotStart
		})),
		lastAdmin: role === 'admin' && admins.length <= 1
	};
}

async function closeOwnerSide(tx: Tx, userId: string, now: Date, keys: string[]) {
	// Bookings lock the job first, so with the owner's jobs locked no booking can start meanwhile.
	await tx.select({ id: job.id }).from(job).where(eq(job.ownerId, userId)).for('update');
	const [active] = await activeBookingsOf(tx, userId, now);
	if (active) throw new Refused(refuse(409, bookingInProgress(titleOrUntitled(active.title))));
	await tx
		.update(job)
		.set({
			status: 'withdrawn',
			withdrawnReason: CLOSED_OWNER_WITHDRAWAL,
			withdrawnAt: now,
			updatedAt: now
		})
		.where(and(eq(job.ownerId, userId), eq(job.status, 'collecting_quotes')));
	const drafts = tx
		.select({ id: job.id })
		.from(job)
		.where(and(eq(job.ownerId, userId), eq(job.status, 'drafting')));
	const photos = await tx
		.select({ objectKey: jobPhoto.objectKey, thumbKey: jobPhoto.thumbKey })
		.from(jobPhoto)
		.where(inArray(jobPhoto.jobId, drafts));
	keys.push(...photos.flatMap((p) => [p.objectKey, p.thumbKey]));
	await tx.delete(job).where(and(eq(job.ownerId, userId), eq(job.status, 'drafting')));
	// The street address was for the installer of a fit; what stays keeps only the suburb.
	await tx
		.update(job)
		.set({ addressLine: null, draft: sql`${job.draft} - 'addressLine'` })
		.where(eq(job.ownerId, userId));
}

async function closeInstallerSide(tx: Tx, mail: Mail, userId: string, now: Date, keys: string[]) {
	const row = await lockProfile(tx, userId);
	const [active] = await activeBookingsOf(tx, userId, now);
	if (active) throw new Refused(refuse(409, bookingInProgress(titleOrUntitled(active.title))));
	if (!row) return;
	await withdrawLiveQuotes(tx, mail, row.profile);
	await tx
		.update(installerProfile)
		.set({
			pausedReason: CLOSED_INSTALLER_PAUSE,
			contactName: null,
			phone: null,
			workshopAddress: null,
			updatedAt: now
		})
		.where(eq(installerProfile.userId, userId));
	const removed = await tx
		.delete(installerDocument)
		.where(
			and(
				eq(installerDocument.installerId, userId),
				inArray(installerDocument.kind, ['photo-id', 'gallery'])
			)
		)
		.returning({ objectKey: installerDocument.objectKey, thumbKey: installerDocument.thumbKey });
	keys.push(...removed.flatMap((d) => [d.objectKey, ...(d.thumbKey ? [d.thumbKey] : [])]));
	await recordEvent(tx, {
		installerId: userId,
		actorId: userId,
		action: 'account-closed',
		fromStatus: row.profile.vettingStatus,
		toStatus: row.profile.vettingStatus
	});
}

/**
 * Closes the account after checking its password and the explicit confirmation (the form's
 * tick). Refuses, changing nothing, when a booking is in progress or the account is the last
 * admin. Every session of the account ends in the same transaction; the route clears the cookie.
 */
export async function closeAccount(
	userId: string,
	input: { passwordToClose: string; confirmed: boolean }
): Promise<{ ok: true } | Refusal> {
	if (!input.confirmed) {
		return refuse(400, 'Tick the box to say you understand what closing the account does.', {
			fields: { confirm: 'Tick the box to say you understand what closing the account does.' }
		});
	}
	const checked = await checkCurrentPassword(userId, input.passwordToClose, 'passwordToClose');
	if (!checked.ok) return checked;
	const now = new Date();
	// Unpaid holds that already ran out are let go first (and their installers told), as the
	// schedule would, so they do not stop the closing.
	await withMail((tx, mail) =>
		lapseHolds(tx, mail, or(eq(booking.ownerId, userId), eq(booking.installerId, userId)), now)
	);
	const keys: string[] = [];
	try {
		await withMail(async (tx, mail) => {
			const [me] = await tx
				.select({ role: user.role, email: user.email, displayName: user.displayName })
				.from(user)
				.where(and(eq(user.id, userId), isNull(user.deletedAt)))
				.for('update');
			if (!me) throw new Refused(refuse(404, 'There is no such account.'));
			if (me.role === 'admin') {
				// Locking every admin row serves two admins closing at once one after the other. A
				// suspended admin cannot act, so does not count.
				const admins = await tx
					.select({ id: user.id })
					.from(user)
					.where(and(eq(user.role, 'admin'), isNull(user.deletedAt), isNull(user.suspendedAt)))
					.for('update');
				if (admins.length <= 1) throw new Refused(refuse(409, LAST_ADMIN));
			}
			if (me.role === 'owner') await closeOwnerSide(tx, userId, now, keys);
			if (me.role === 'installer') await closeInstallerSide(tx, mail, userId, now, keys);
			await mail.send(me.email, {
				template: 'account-closed',
				data: { displayName: me.displayName }
			});
			await tx.delete(emailToken).where(eq(emailToken.userId, userId));
			await endSessionsExcept(userId, null, tx);
			await tx
				.update(user)
				.set({
					email: `closed-${userId}@closed.invalid`,
					displayName: CLOSED_ACCOUNT_NAME,
					// Not an argon2 hash: no password ever matches it.
					passwordHash: '!closed',
					emailVerifiedAt: null,
					deletedAt: now
				})
				.where(eq(user.id, userId));
			mail.afterCommit(async () => {
				for (const key of keys) {
					// A file left behind is unreachable (no row points at it); never fail the closing.
					await deleteObject(key).catch((err: unknown) => {
						console.error('[account-closing] could not delete', key, err);
					});
				}
			});
		});
	} catch (err) {
		if (err instanceof Refused) return err.refusal;
		throw err;
	}
	return { ok: true };
}

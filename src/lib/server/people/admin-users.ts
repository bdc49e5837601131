/**
 * Admins looking after accounts: find any account, read its jobs, quotes, bookings and audit
 * trail, suspend and reinstate with a reason, and force a new password. Every change locks the
 * account row, writes its admin_audit row (append-only) and queues its e-mail in one transaction;
 * an admin cannot act on their own account here, and the last active admin cannot be suspended.
 */
import { and, count, desc, eq, ilike, isNotNull, isNull, ne, or, type SQL } from 'drizzle-orm';
import { randomBytes } from 'node:crypto';
import { issueResetLink } from './accounts';
import { endAllSessionsIn } from '../auth';
import { db, type Tx } from '../db';
import { adminAudit, booking, installerProfile, job, quote, user, type Role } from '../db/schema';
import { appUrl } from '../mail/app-url';
import { withMail } from '../mail/outbox';
import { hashPassword } from './password';
import { isRefusal, refuse, type Refusal } from '../refusal';
import { withdrawLiveQuotes } from './vetting';

/** Accounts on one page of the admin's list. */
export const USERS_PAGE_SIZE = 25;

/** What the admin's account list can filter on. */
export interface UserQuery {
	/** Part of a name or e-mail address. */
	q: string;
	role: Role | '';
	standing: 'active' | 'suspended' | '';
	page: number;
}

/** `%` and `_` typed by the admin are matched as themselves, not as wildcards. */
const likeEscape = (text: string) => text.replace(/[\\%_]/g, (c) => `\\${c}`);

/** One page of accounts, newest first, filtered and paged in SQL. */
export async function searchUsers(query: UserQuery) {
	const where: SQL[] = [];
	const q = query.q.trim();
	if (q) {
		const pattern = `%${likeEscape(q)}%`;
		where.push(or(ilike(user.displayName, pattern), ilike(user.email, pattern))!);
	}
	if (query.role) where.push(eq(user.role, query.role));
	if (query.standing === 'active') where.push(isNull(user.suspendedAt));
	if (query.standing === 'suspended') where.push(isNotNull(user.suspendedAt));
	const filter = where.length ? and(...where) : undefined;
	const rows = await db
		.select({
			id: user.id,
			displayName: user.displayName,
			email: user.email,
			role: user.role,
			suspendedAt: user.suspendedAt,
			createdAt: user.createdAt,
			businessName: installerProfile.businessName
		})
		.from(user)
		.leftJoin(installerProfile, eq(installerProfile.userId, user.id))
		.where(filter)
		.orderBy(desc(user.createdAt), desc(user.id))
		.limit(USERS_PAGE_SIZE)
		.offset((query.page - 1) * USERS_PAGE_SIZE);
	const [total] = await db.select({ n: count() }).from(user).where(filter);
	return { rows, total: total?.n ?? 0 };
}

/** How many of each thing the account page lists at most (newest first). */
const RECENT = 10;

/** One account as an admin sees it, or null when there is none. */
export async function getUserForAdmin(userId: string) {
	const [account] = await db
		.select({
			id: user.id,
			displayName: user.displayName,
			email: user.email,
			role: user.role,
			emailVerifiedAt: user.emailVerifiedAt,
			suspendedAt: user.suspendedAt,
			suspendedReason: user.suspendedReason,
			createdAt: user.createdAt,
			businessName: installerProfile.businessName,
			vettingStatus: installerProfile.vettingStatus
		})
		.from(user)
		.leftJoin(installerProfile, eq(installerProfile.userId, user.id))
		.where(eq(user.id, userId));
	if (!account) return null;
	const jobs = await db
		.select({ id: job.id, title: job.title, status: job.status, createdAt: job.createdAt })
		.from(job)
		.where(eq(job.ownerId, userId))
		.orderBy(desc(job.createdAt))
		.limit(RECENT);
	const quotes = await db
		.select({
			id: quote.id,
			jobId: quote.jobId,
			title: job.title,
			status: quote.status,
			totalCents: quote.totalCents,
			updatedAt: quote.updatedAt
		})
		.from(quote)
		.innerJoin(job, eq(job.id, quote.jobId))
		.where(eq(quote.installerId, userId))
		.orderBy(desc(quote.updatedAt))
		.limit(RECENT);
	const bookings = await db
		.select({
			id: booking.id,
			jobId: booking.jobId,
			title: job.title,
			status: booking.status,
			slotStart: booking.slotStart,
			totalCents: booking.totalCents
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.where(or(eq(booking.ownerId, userId), eq(booking.installerId, userId)))
		.orderBy(desc(booking.createdAt))
		.limit(RECENT);
	const trail = await db
		.select({
			id: adminAudit.id,
			action: adminAudit.action,
			reason: adminAudit.reason,
			before: adminAudit.before,
			after: adminAudit.after,
			createdAt: adminAudit.createdAt,
			actorName: user.displayName
		})
		.from(adminAudit)
		.innerJoin(user, eq(user.id, adminAudit.actorId))
		.where(eq(adminAudit.targetUserId, userId))
		.orderBy(desc(adminAudit.createdAt));
	return { account, jobs, quotes, bookings, trail };
}

/** An admin's change to an account that went through. */
export type AccountAction = { ok: true } | Refusal;

/** The account's standing as the audit trail records it. */
const standingOf = (row: { suspendedAt: Date | null; suspendedReason: string | null }) => ({
	suspended: row.suspendedAt !== null,
	reason: row.suspendedReason
});

/** Locks the target account for an admin's change; refuses the admin's own account. */
async function lockTarget(tx: Tx, adminId: string, targetId: string, doing: string) {
	if (adminId === targetId) {
		return refuse(409, `You cannot ${doing} your own account here; ask another admin.`);
	}
	const [row] = await tx.select().from(user).where(eq(user.id, targetId)).for('update');
	if (row?.deletedAt) return refuse(409, 'This account is closed; there is nothing to change.');
	return row ?? refuse(404, 'There is no such account.');
}

/**
 * Suspends an account: it is signed out everywhere and cannot sign in; an installer's live
 * quotes are withdrawn and each owner told. Bookings already made stay for an admin to settle.
 */
export async function suspendAccount(
	adminId: string,
	targetId: string,
	reason: string,
	now = new Date()
): Promise<AccountAction> {
	return withMail(async (tx, mail) => {
		const row = await lockTarget(tx, adminId, targetId, 'suspend');
		if (isRefusal(row)) return row;
		if (row.suspendedAt) return refuse(409, 'This account is suspended already.');
		if (row.role === 'admin') {
			// Admin rows are locked in a fixed order by every suspension, so two admins suspending
			// each other at once end with one of them still active.
			const admins = await tx
				.select({ id: user.id })
				.from(user)
				.where(
					and(
						eq(user.role, 'admin'),
						isNull(user.suspendedAt),
						isNull(user.deletedAt),
						ne(user.id, targetId)
					)
				)
				.orderBy(user.id)
				.for('update');
			if (admins.length === 0) {
				return refuse(409, 'This is the last active admin; Tapline needs at least one.');
			}
		}
		await tx
			.update(user)
			.set({ suspendedAt: now, suspendedReason: reason })
			.where(eq(user.id, targetId));
		await endAllSessionsIn(tx, targetId);
		if (row.role === 'installer') {
			const [profile] = await tx
				.select()
				.from(installerProfile)
				.where(eq(installerProfile.userId, targetId))
				.for('update');
			if (profile) await withdrawLiveQuotes(tx, mail, profile);
		}
		await tx.insert(adminAudit).values({
			actorId: adminId,
			action: 'suspend',
			targetUserId: targetId,
			before: standingOf(row),
			after: { suspended: true, reason },
			reason,
			createdAt: now
		});
		await mail.send(row.email, {
			template: 'account-suspended',
			data: { displayName: row.displayName, reason }
		});
		return { ok: true };
	});
}

/** Lifts a suspension; the account may sign in again. Withdrawn quotes stay withdrawn. */
export async function reinstateAccount(
	adminId: string,
	targetId: string,
	reason: string,
	now = new Date()
): Promise<AccountAction> {
	return withMail(async (tx, mail) => {
		const row = await lockTarget(tx, adminId, targetId, 'reinstate');
		if (isRefusal(row)) return row;
		if (!row.suspendedAt) return refuse(409, 'This account is not suspended.');
		await tx
			.update(user)
			.set({ suspendedAt: null, suspendedReason: null })
			.where(eq(user.id, targetId));
		await tx.insert(adminAudit).values({
			actorId: adminId,
			action: 'reinstate',
			targetUserId: targetId,
			before: standingOf(row),
			after: { suspended: false, reason: null },
			reason,
			createdAt: now
		});
		await mail.send(row.email, {
			template: 'account-reinstated',
			data: { displayName: row.displayName, url: appUrl('/sign-in') }
		});
		return { ok: true };
	});
}

/**
 * Makes an account choose a new password: signs it out everywhere, replaces the password with
 * one nobody knows and e-mails a one-hour reset link.
 */
export async function forcePasswordReset(
	adminId: string,
	targetId: string,
	reason: string,
	now = new Date()
): Promise<AccountAction> {
	// Hashed before the transaction: argon2id takes a while, and no row should wait for it.
	const unknowable = await hashPassword(randomBytes(32).toString('base64url'));
	return withMail(async (tx, mail) => {
		const row = await lockTarget(tx, adminId, targetId, 'force a new password on');
		if (isRefusal(row)) return row;
		await tx.update(user).set({ passwordHash: unknowable }).where(eq(user.id, targetId));
		await endAllSessionsIn(tx, targetId);
		const url = await issueResetLink(tx, targetId);
		await tx.insert(adminAudit).values({
			actorId: adminId,
			action: 'force-password-reset',
			targetUserId: targetId,
			before: null,
			after: null,
			reason,
			createdAt: now
		});
		await mail.send(row.email, {
			template: 'password-reset-by-admin',
			data: { displayName: row.displayName, url }
		});
		return { ok: true };
	});
}

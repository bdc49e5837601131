/**
 * Accounts: sign-up, sign-in checks, e-mail verification, password reset, admin invitations.
 * Every change that sends mail queues it in the same transaction (`withMail`).
 */
import { createHash, randomBytes } from 'node:crypto';
import { and, eq, gt, isNull } from 'drizzle-orm';
import { endAllSessions } from '../auth';
import { db, type Tx } from '../db';
import { adminAudit, emailToken, user, type Role, type User } from '../db/schema';
import { appUrl } from '../mail/app-url';
import { withMail } from '../mail/outbox';
import { refuse, type Refusal } from '../refusal';
import { hashPassword, verifyPassword } from './password';
import {
	clearSignInLimits,
	consumeResetRequest,
	consumeSignInAttempt,
	consumeSignUpNotice,
	recordSuccessfulSignIn
} from '../rate-limit';

/** How long a confirmation link works (also for a new address). */
export const VERIFY_TTL_MS = 48 * 3600_000;
const RESET_TTL_MS = 3600_000;

const emailTaken = () =>
	refuse(
		409,
		'An account already uses this address. Sign in, or reset the password from the sign-in page.',
		{
			fields: {
				email:
					'An account already uses this address. Sign in, or reset the password from the sign-in page.'
			}
		}
	);

type TokenPurpose = 'verify-email' | 'reset-password' | 'change-email';

/** Account fields safe to hand to callers (never the password hash). */
export type AccountSummary = Pick<User, 'id' | 'email' | 'role' | 'displayName'>;

/** E-mail addresses compare case-insensitively; we store them lower-cased and trimmed. */
export const normaliseEmail = (email: string) => email.trim().toLowerCase();

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/** Ends every unused link of this purpose for the account: only the newest one ever works. */
export async function endUnusedTokens(tx: Tx, userId: string, purpose: TokenPurpose) {
	await tx
		.update(emailToken)
		.set({ usedAt: new Date() })
		.where(
			and(eq(emailToken.userId, userId), eq(emailToken.purpose, purpose), isNull(emailToken.usedAt))
		);
}

/**
 * Issues a one-time link token (only its SHA-256 is stored), ending the account's earlier unused
 * ones of the same purpose.
 * @param newEmail for 'change-email': the address the account moves to when the link is used
 */
export async function issueToken(
	tx: Tx,
	userId: string,
	purpose: TokenPurpose,
	ttlMs: number,
	newEmail: string | null = null
) {
	await endUnusedTokens(tx, userId, purpose);
	const token = randomBytes(32).toString('base64url');
	await tx.insert(emailToken).values({
		tokenHash: hashToken(token),
		userId,
		purpose,
		newEmail,
		expiresAt: new Date(Date.now() + ttlMs)
	});
	return token;
}

/** Uses up a token that is unused and not expired; returns its account and new address. */
export async function takeToken(tx: Tx, token: string, purpose: TokenPurpose) {
	const row = await takeTokenRow(tx, token, purpose);
	return row?.userId ?? null;
}

/** As {@link takeToken}, with the token's new address (for 'change-email'). */
export async function takeTokenRow(tx: Tx, token: string, purpose: TokenPurpose) {
	const [row] = await tx
		.update(emailToken)
		.set({ usedAt: new Date() })
		.where(
			and(
				eq(emailToken.tokenHash, hashToken(token)),
				eq(emailToken.purpose, purpose),
				isNull(emailToken.usedAt),
				gt(emailToken.expiresAt, new Date())
			)
		)
		.returning({ userId: emailToken.userId, newEmail: emailToken.newEmail });
	return row ?? null;
}

export interface NewAccount {
	email: string;
	password: string;
	displayName: string;
	role: Extract<Role, 'owner' | 'installer'>;
}

/**
 * Creates an owner or installer account and queues the verification e-mail. An address that
 * already has an account gets an e-mail saying someone tried to sign up with it (at most a few an
 * hour), and nothing else changes. The caller must answer both cases alike (say "check your
 * inbox", start no session), so sign-up cannot tell anyone which addresses have accounts.
 * @returns the new account, or null when the address was taken
 */
export async function createAccount(
	input: NewAccount
): Promise<{ ok: true; user: AccountSummary | null }> {
	const email = normaliseEmail(input.email);
	const passwordHash = await hashPassword(input.password);
	const created = await withMail(async (tx, mail) => {
		const [made] = await tx
			.insert(user)
			.values({
				id: crypto.randomUUID(),
				email,
				passwordHash,
				role: input.role,
				displayName: input.displayName.trim()
			})
			.onConflictDoNothing({ target: user.email })
			.returning({
				id: user.id,
				email: user.email,
				role: user.role,
				displayName: user.displayName
			});
		if (!made) return null;
		const token = await issueToken(tx, made.id, 'verify-email', VERIFY_TTL_MS);
		await mail.send(email, {
			template: 'verify-email',
			data: { displayName: made.displayName, url: appUrl(`/verify-email?token=${token}`) }
		});
		return made;
	});
	if (!created && (await consumeSignUpNotice(email)).allowed) {
		await withMail(async (_tx, mail) => {
			await mail.send(email, {
				template: 'sign-up-existing',
				data: { signInUrl: appUrl('/sign-in'), resetUrl: appUrl('/forgot-password') }
			});
		});
	}
	return { ok: true, user: created };
}

// A real argon2id hash of a random string: checking against it when the account does not exist
// costs the same time as a real check, so response times do not reveal which addresses exist.
let decoyHash: Promise<string> | undefined;

/** Checks an e-mail and password; returns the account or null, in constant-ish time. */
export async function authenticate(
	email: string,
	password: string
): Promise<AccountSummary | null> {
	const [found] = await db
		.select({
			id: user.id,
			email: user.email,
			role: user.role,
			displayName: user.displayName,
			passwordHash: user.passwordHash
		})
		.from(user)
		.where(eq(user.email, normaliseEmail(email)));
	if (!found) {
		decoyHash ??= hashPassword(randomBytes(16).toString('hex'));
		await verifyPassword(await decoyHash, password);
		return null;
	}
	if (!(await verifyPassword(found.passwordHash, password))) return null;
	const { passwordHash: _hash, ...summary } = found;
	return summary;
}

/** Why a sign-in did not go through, in the same words whichever part was wrong. */
export const SIGN_IN_MISMATCH = 'That e-mail and password do not match an account.';

/**
 * Signs in with throttling: the attempt is taken from the allowances (`consumeSignInAttempt`,
 * atomic) before the password is checked, so parallel guesses cannot outrun the count.
 * @param address the client's address, for the per-address and per-(account, address) limits
 */
export async function signIn(
	email: string,
	password: string,
	address: string
): Promise<{ ok: true; account: AccountSummary } | Refusal> {
	const gate = await consumeSignInAttempt(email, address);
	if (!gate.allowed) {
		const minutes = Math.ceil(gate.retryAfterSeconds / 60);
		return refuse(
			429,
			`Too many sign-in attempts. Wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again, or reset your password: the link in the e-mail always works.`
		);
	}
	const account = await authenticate(email, password);
	if (!account) return refuse(400, SIGN_IN_MISMATCH);
	// Only someone who knows the password learns the account is suspended.
	const [standing] = await db
		.select({ suspendedAt: user.suspendedAt })
		.from(user)
		.where(eq(user.id, account.id));
	if (standing?.suspendedAt) return refuse(403, SUSPENDED_SIGN_IN);
	await recordSuccessfulSignIn(email, address);
	return { ok: true, account };
}

/**
 * Ends every earlier reset link of the account and issues a fresh one, inside the caller's
 * transaction (an admin's forced reset); returns the link to e-mail.
 */
export async function issueResetLink(tx: Tx, userId: string): Promise<string> {
	const token = await issueToken(tx, userId, 'reset-password', RESET_TTL_MS);
	return appUrl(`/reset-password?token=${token}`);
}

/** What a suspended account is told when it tries to sign in. */
export const SUSPENDED_SIGN_IN =
	'This account is suspended, so it cannot sign in. The e-mail we sent says why; reply to it to talk it through with us.';

/**
 * Marks the address of the token's account verified.
 * @returns the account's id (the link proves control of the mailbox, so the page may sign it
 * in), or null for an unknown, used or expired token
 */
export async function verifyEmailToken(token: string): Promise<string | null> {
	return db.transaction(async (tx) => {
		const userId = await takeToken(tx, token, 'verify-email');
		if (!userId) return null;
		await tx.update(user).set({ emailVerifiedAt: new Date() }).where(eq(user.id, userId));
		return userId;
	});
}

/** Queues a fresh verification e-mail for an unverified account; false when already verified. */
export async function resendVerification(userId: string): Promise<boolean> {
	return withMail(async (tx, mail) => {
		const [found] = await tx
			.select({ email: user.email, displayName: user.displayName, verified: user.emailVerifiedAt })
			.from(user)
			.where(eq(user.id, userId));
		if (!found || found.verified) return false;
		const token = await issueToken(tx, userId, 'verify-email', VERIFY_TTL_MS);
		await mail.send(found.email, {
			template: 'verify-email',
			data: { displayName: found.displayName, url: appUrl(`/verify-email?token=${token}`) }
		});
		return true;
	});
}

/**
 * Queues a reset link when the address has an account, ending every earlier unused one. Says
 * nothing either way to the caller's visitor, so the form cannot be used to find out who has an
 * account; requests are limited per client address and per address typed (known or not).
 * @param address the client's address
 */
export async function requestPasswordReset(
	email: string,
	address: string
): Promise<{ ok: true } | Refusal> {
	const gate = await consumeResetRequest(email, address);
	if (!gate.allowed) {
		const minutes = Math.ceil(gate.retryAfterSeconds / 60);
		return refuse(
			429,
			`Too many reset requests. Use the newest link we sent, or wait ${minutes} minute${minutes === 1 ? '' : 's'} and ask again.`
		);
	}
	await withMail(async (tx, mail) => {
		const [found] = await tx
			.select({ id: user.id, email: user.email, displayName: user.displayName })
			.from(user)
			.where(eq(user.email, normaliseEmail(email)));
		if (!found) return;
		const token = await issueToken(tx, found.id, 'reset-password', RESET_TTL_MS);
		await mail.send(found.email, {
			template: 'reset-password',
			data: { displayName: found.displayName, url: appUrl(`/reset-password?token=${token}`) }
		});
	});
	return { ok: true };
}

/** Sets a new password from a reset token and signs the account out everywhere. */
export async function resetPassword(token: string, newPassword: string): Promise<boolean> {
	const passwordHash = await hashPassword(newPassword);
	const changed = await db.transaction(async (tx) => {
		const id = await takeToken(tx, token, 'reset-password');
		if (!id) return null;
		await endUnusedTokens(tx, id, 'reset-password');
		// A working reset link proves control of the mailbox, so it verifies the address too.
		const [row] = await tx
			.update(user)
			.set({ passwordHash, emailVerifiedAt: new Date() })
			.where(eq(user.id, id))
			.returning({ email: user.email });
		return row ? { id, email: row.email } : null;
	});
	if (!changed) return false;
	await endAllSessions(changed.id);
	// Whoever was guessing this account's password no longer keeps its holder out.
	await clearSignInLimits(changed.email);
	return true;
}

/**
 * Creates an admin account on behalf of another admin. The new admin gets an e-mail with a link to
 * set their own password; nobody ever knows the random one it starts with.
 */
export async function createAdminAccount(
	invitedBy: AccountSummary,
	input: { email: string; displayName: string }
): Promise<{ ok: true; user: AccountSummary } | Refusal> {
	if (invitedBy.role !== 'admin') throw new Error('Only an admin can create an admin');
	const passwordHash = await hashPassword(randomBytes(24).toString('base64url'));
	return withMail(async (tx, mail) => {
		const [created] = await tx
			.insert(user)
			.values({
				id: crypto.randomUUID(),
				email: normaliseEmail(input.email),
				passwordHash,
				role: 'admin',
				displayName: input.displayName.trim()
			})
			.onConflictDoNothing({ target: user.email })
			.returning({
				id: user.id,
				email: user.email,
				role: user.role,
				displayName: user.displayName
			});
		if (!created) return emailTaken();
		await tx.insert(adminAudit).values({
			actorId: invitedBy.id,
			action: 'admin-invite',
			targetUserId: created.id,
			before: null,
			after: { email: created.email, displayName: created.displayName, role: 'admin' },
			reason: null
		});
		const token = await issueToken(tx, created.id, 'reset-password', RESET_TTL_MS);
		await mail.send(created.email, {
			template: 'admin-invite',
			data: {
				displayName: created.displayName,
				invitedBy: invitedBy.displayName,
				url: appUrl(`/reset-password?token=${token}`)
			}
		});
		return { ok: true as const, user: created };
	});
}

/** Admin accounts, newest first, for the admin team page. */
export async function listAdmins(): Promise<AccountSummary[]> {
	return db
		.select({ id: user.id, email: user.email, role: user.role, displayName: user.displayName })
		.from(user)
		.where(and(eq(user.role, 'admin'), isNull(user.deletedAt)))
		.orderBy(user.createdAt);
}

/**
 * A person's own account settings: display name, e-mail address (a new one counts only once its
 * link is used), password, and their sessions. Closing the account is in account-closing.ts.
 * Every change that sends mail queues it in the same transaction (`withMail`).
 */
import { and, eq, gt, isNull } from 'drizzle-orm';
import {
	endUnusedTokens,
	issueToken,
	normaliseEmail,
	takeTokenRow,
	VERIFY_TTL_MS
} from './accounts';
import { endSessionByHandle, endSessionsExcept, listSessions } from '../auth';
import { db } from '../db';
import { emailToken, user } from '../db/schema';
import { appUrl } from '../mail/app-url';
import { withMail } from '../mail/outbox';
import { hashPassword, verifyPassword } from './password';
import {
	consumeAccountPasswordCheck,
	consumeEmailChangeRequest,
	consumeSignUpNotice,
	type ThrottleResult
} from '../rate-limit';
import { refuse, type Refusal } from '../refusal';

export type SettingsOutcome = { ok: true } | Refusal;

/** The words of a wrong current password, on its field and as the form's message. */
export const WRONG_CURRENT_PASSWORD = 'That is not your current password.';

const wait = (gate: Extract<ThrottleResult, { allowed: false }>, what: string) => {
	const minutes = Math.ceil(gate.retryAfterSeconds / 60);
	return refuse(429, `${what} Wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again.`);
};

/**
 * Checks the account's current password, after taking the check from the account's allowance
 * (so a borrowed session cannot be used to guess it).
 * @param field the form field the password was typed in, for the refusal's field message
 * @returns the account's address and name, or a 429 / 400 refusal (the 400 on `field`)
 */
export async function checkCurrentPassword(
	userId: string,
	password: string,
	field = 'currentPassword'
): Promise<{ ok: true; email: string; displayName: string } | Refusal> {
	const gate = await consumeAccountPasswordCheck(userId);
	if (!gate.allowed) return wait(gate, 'Too many password checks on this account.');
	const [row] = await db
		.select({
			email: user.email,
			displayName: user.displayName,
			passwordHash: user.passwordHash
		})
		.from(user)
		.where(and(eq(user.id, userId), isNull(user.deletedAt)));
	if (!row) return refuse(404, 'There is no such account.');
	if (!(await verifyPassword(row.passwordHash, password))) {
		return refuse(400, WRONG_CURRENT_PASSWORD, {
			fields: { [field]: WRONG_CURRENT_PASSWORD }
		});
	}
	return { ok: true, email: row.email, displayName: row.displayName };
}

/** What the account page shows: name, address, a change of address waiting, and the sessions. */
export async function getAccountSettings(userId: string, currentSessionId: string) {
	const [[row], [pending], sessions] = [
		await db
			.select({
				email: user.email,
				displayName: user.displayName,
				role: user.role,
				emailVerifiedAt: user.emailVerifiedAt
			})
			.from(user)
			.where(eq(user.id, userId)),
		await db
			.select({ newEmail: emailToken.newEmail, expiresAt: emailToken.expiresAt })
			.from(emailToken)
			.where(
				and(
					eq(emailToken.userId, userId),
					eq(emailToken.purpose, 'change-email'),
					isNull(emailToken.usedAt),
					gt(emailToken.expiresAt, new Date())
				)
			),
		await listSessions(userId, currentSessionId)
	];
	if (!row) return null;
	return {
		...row,
		pendingEmail: pending?.newEmail ? { to: pending.newEmail, until: pending.expiresAt } : null,
		sessions
	};
}

/** Changes the name shown to others and in e-mails. */
export async function changeDisplayName(
	userId: string,
	displayName: string
): Promise<SettingsOutcome> {
	const [row] = await db
		.update(user)
		.set({ displayName: displayName.trim() })
		.where(and(eq(user.id, userId), isNull(user.deletedAt)))
		.returning({ id: user.id });
	return row ? { ok: true } : refuse(404, 'There is no such account.');
}

/**
 * Asks to move the account to a new address. The old address stays in force until the link sent
 * to the new one is used, and is told of the request. An address that already has an account
 * gets a notice instead of a link (at most a few an hour), and the answer here is the same
 * either way, so, as with sign-up, the form cannot tell anyone which addresses have accounts;
 * the link page refuses if the address is taken by the time it is used.
 */
export async function requestEmailChange(
	userId: string,
	input: { newEmail: string; passwordForEmail: string }
): Promise<{ ok: true; sentTo: string } | Refusal> {
	const checked = await checkCurrentPassword(userId, input.passwordForEmail, 'passwordForEmail');
	if (!checked.ok) return checked;
	const newEmail = normaliseEmail(input.newEmail);
	if (newEmail === checked.email) {
		return refuse(400, 'That is already your address.', {
			fields: { newEmail: 'That is already your address.' }
		});
	}
	const gate = await consumeEmailChangeRequest(userId);
	if (!gate.allowed) return wait(gate, 'Too many changes of address asked for today.');
	const [taken] = await db.select({ id: user.id }).from(user).where(eq(user.email, newEmail));
	const noticeAllowed = taken ? (await consumeSignUpNotice(newEmail)).allowed : false;
	await withMail(async (tx, mail) => {
		// A token is stored either way, so the page shows the same "waiting for the link" state.
		const token = await issueToken(tx, userId, 'change-email', VERIFY_TTL_MS, newEmail);
		if (!taken) {
			await mail.send(newEmail, {
				template: 'email-change-confirm',
				data: { displayName: checked.displayName, url: appUrl(`/account/email?token=${token}`) }
			});
		} else if (noticeAllowed) {
			await mail.send(newEmail, {
				template: 'email-change-existing',
				data: { signInUrl: appUrl('/sign-in') }
			});
		}
		await mail.send(checked.email, {
			template: 'email-change-requested',
			data: { displayName: checked.displayName, newEmail }
		});
	});
	return { ok: true, sentTo: newEmail };
}

/** Words of a taken address at the link page (only the new mailbox's holder sees them). */
export const EMAIL_NOW_TAKEN =
	'This address already belongs to another Tapline account, so your account keeps its old address. Ask for a change to a different address.';

const isUniqueViolation = (err: unknown) =>
	typeof err === 'object' &&
	err !== null &&
	((err as { code?: string }).code === '23505' ||
		(err as { cause?: { code?: string } }).cause?.code === '23505');

/**
 * Uses a change-of-address link: the account moves to the new address (confirmed by the link)
 * and the old one is told. Unused reset and confirmation links, sent to the old address, end.
 * @returns the account's id, or a 400 (unknown, used or expired link) or 409 (address taken)
 */
export async function confirmEmailChange(
	token: string
): Promise<{ ok: true; userId: string } | Refusal> {
	try {
		return await withMail(async (tx, mail) => {
			const taken = await takeTokenRow(tx, token, 'change-email');
			if (!taken?.newEmail) {
				return refuse(
					400,
					'This link has expired or was already used. Sign in and ask for the change again on your account page.'
				);
			}
			const [old] = await tx
				.select({ email: user.email, displayName: user.displayName })
				.from(user)
				.where(and(eq(user.id, taken.userId), isNull(user.deletedAt)))
				.for('update');
			if (!old) return refuse(400, 'This account is closed.');
			const [other] = await tx
				.select({ id: user.id })
				.from(user)
				.where(eq(user.email, taken.newEmail));
			if (other) return refuse(409, EMAIL_NOW_TAKEN);
			await tx
				.update(user)
				.set({ email: taken.newEmail, emailVerifiedAt: new Date() })
				.where(eq(user.id, taken.userId));
			await endUnusedTokens(tx, taken.userId, 'reset-password');
			await endUnusedTokens(tx, taken.userId, 'verify-email');
			await mail.send(old.email, {
				template: 'email-changed',
				data: { displayName: old.displayName, newEmail: taken.newEmail }
			});
			return { ok: true as const, userId: taken.userId };
		});
	} catch (err) {
		// Someone signed up with the address between the check and the update.
		if (isUniqueViolation(err)) return refuse(409, EMAIL_NOW_TAKEN);
		throw err;
	}
}

/**
 * Changes the password after checking the current one; every other session of the account ends
 * in the same transaction (this one stays), unused reset links end, and the account is told.
 * @returns how many other sessions ended
 */
export async function changePassword(
	userId: string,
	currentSessionId: string,
	input: { currentPassword: string; newPassword: string }
): Promise<{ ok: true; endedSessions: number } | Refusal> {
	const checked = await checkCurrentPassword(userId, input.currentPassword);
	if (!checked.ok) return checked;
	if (input.newPassword === input.currentPassword) {
		return refuse(400, 'Choose a password different from the current one.', {
			fields: { newPassword: 'Choose a password different from the current one.' }
		});
	}
	const passwordHash = await hashPassword(input.newPassword);
	const endedSessions = await withMail(async (tx, mail) => {
		await tx.update(user).set({ passwordHash }).where(eq(user.id, userId));
		await endUnusedTokens(tx, userId, 'reset-password');
		const ended = await endSessionsExcept(userId, currentSessionId, tx);
		await mail.send(checked.email, {
			template: 'password-changed',
			data: { displayName: checked.displayName, resetUrl: appUrl('/forgot-password') }
		});
		return ended;
	});
	return { ok: true, endedSessions };
}

/** Ends one of the account's other sessions, named by its handle (see `sessionHandle`). */
export async function endOtherSession(
	userId: string,
	handle: string,
	currentSessionId: string
): Promise<SettingsOutcome> {
	const outcome = await endSessionByHandle(userId, handle, currentSessionId);
	if (outcome === 'current') {
		return refuse(400, 'That is this device. To end it, sign out.');
	}
	if (outcome === 'unknown') {
		return refuse(409, 'That session has already ended.');
	}
	return { ok: true };
}

/** Ends every session of the account but this one; returns how many ended. */
export async function endAllOtherSessions(
	userId: string,
	currentSessionId: string
): Promise<number> {
	return endSessionsExcept(userId, currentSessionId);
}

/**
 * Throttling with rate-limiter-flexible, its counters in PostgreSQL (table `rate_limit`, created
 * by our migrations) so that every app process shares them. At a larger scale the same limiter
 * classes run on Redis (RateLimiterRedis) without changing callers.
 *
 * Sign-in attempts are consumed before the password is checked: `consume` is one atomic
 * INSERT … ON CONFLICT DO UPDATE, so a burst of parallel guesses gets exactly the allowance, not
 * one check each. The account's limit is kept per (account, address) pair, so a stranger's wrong
 * guesses lock out their own address, not the account holder's; a slower account-wide limit
 * stops guessing from many addresses, and a working reset link clears it.
 */
import { createHash } from 'node:crypto';
import { sql } from 'drizzle-orm';
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import { db, pool } from './db';
import { rateLimit } from './db/schema';

const WINDOW_SECONDS = 15 * 60;

/** Sign-in attempts allowed per account from one address in the window (Tapline's choice). */
export const PAIR_ATTEMPTS = 5;
/** Sign-in attempts allowed per account from all addresses together in an hour (Tapline's choice). */
export const ACCOUNT_ATTEMPTS = 30;
/** Sign-in attempts allowed per client address in the window, across accounts (password spraying). */
export const ADDRESS_ATTEMPTS = 20;

function limiter(keyPrefix: string, points: number, duration: number) {
	return new RateLimiterPostgres({
		storeClient: pool,
		storeType: 'pool',
		tableName: 'rate_limit',
		tableCreated: true,
		clearExpiredByTimeout: false,
		keyPrefix,
		points,
		duration
	});
}

const signInByAddress = limiter('signin-address', ADDRESS_ATTEMPTS, WINDOW_SECONDS);
const signInByPair = limiter('signin-pair', PAIR_ATTEMPTS, WINDOW_SECONDS);
const signInByAccount = limiter('signin-account', ACCOUNT_ATTEMPTS, 3600);

export type ThrottleResult = { allowed: true } | { allowed: false; retryAfterSeconds: number };

/**
 * Takes one point from each limiter in turn, stopping at the first that is out: a refused
 * attempt does not use up the later (wider) allowances.
 */
async function consumeAll(
	steps: ReadonlyArray<readonly [RateLimiterPostgres, string]>
): Promise<ThrottleResult> {
	for (const [limit, key] of steps) {
		try {
			await limit.consume(key);
		} catch (err) {
			if (!(err instanceof RateLimiterRes)) throw err;
			return { allowed: false, retryAfterSeconds: Math.max(1, Math.ceil(err.msBeforeNext / 1000)) };
		}
	}
	return { allowed: true };
}

// Hashed, so an address of any length fits the table's 255-character key beside a client address.
const accountKey = (email: string) =>
	createHash('sha256').update(email.trim().toLowerCase()).digest('hex');
const pairKey = (email: string, address: string) => `${accountKey(email)}|${address}`;

/**
 * Takes a sign-in attempt from the address's, the (account, address) pair's and the account's
 * allowance, atomically, before any password is checked.
 */
export function consumeSignInAttempt(email: string, address: string): Promise<ThrottleResult> {
	return consumeAll([
		[signInByAddress, address],
		[signInByPair, pairKey(email, address)],
		[signInByAccount, accountKey(email)]
	]);
}

/** After a right password: the pair and account counters start again, the address gets its point back. */
export async function recordSuccessfulSignIn(email: string, address: string): Promise<void> {
	await Promise.all([
		signInByPair.delete(pairKey(email, address)),
		signInByAccount.delete(accountKey(email)),
		signInByAddress.reward(address, 1)
	]);
}

/** Reset links sent per account in an hour (Tapline's choice). */
export const RESET_ACCOUNT_REQUESTS = 3;
/** Reset requests per client address in an hour, whatever the accounts (Tapline's choice). */
export const RESET_ADDRESS_REQUESTS = 10;

const resetByAddress = limiter('reset-address', RESET_ADDRESS_REQUESTS, 3600);
const resetByAccount = limiter('reset-account', RESET_ACCOUNT_REQUESTS, 3600);

/**
 * Takes a password-reset request from the address's and the account's allowance. The account key
 * is the address typed, whether or not it has an account, so the answer reveals nothing.
 */
export function consumeResetRequest(email: string, address: string): Promise<ThrottleResult> {
	return consumeAll([
		[resetByAddress, address],
		[resetByAccount, accountKey(email)]
	]);
}

/** "Someone tried to sign up with your address" e-mails per address in an hour (Tapline's choice). */
export const SIGN_UP_NOTICES = 3;
const signUpNotices = limiter('signup-notice', SIGN_UP_NOTICES, 3600);

/** Takes one notice from the address's allowance, so sign-up cannot be used to flood a mailbox. */
export function consumeSignUpNotice(email: string): Promise<ThrottleResult> {
	return consumeAll([[signUpNotices, accountKey(email)]]);
}

/**
 * Clears every sign-in counter of an account (all its address pairs too): a working reset link
 * proves control of the mailbox, so whoever was guessing no longer keeps the holder out.
 */
export async function clearSignInLimits(email: string): Promise<void> {
	const key = accountKey(email);
	await db
		.delete(rateLimit)
		.where(
			sql`${rateLimit.key} = ${`signin-account:${key}`} or starts_with(${rateLimit.key}, ${`signin-pair:${key}|`})`
		);
}

/**
 * Current-password checks on the account page (changing e-mail or password, closing the account)
 * per account in the window (Tapline's choice): a stolen session cannot be used to guess the
 * password, and a person who mistypes a few times is not held up.
 */
export const ACCOUNT_PASSWORD_CHECKS = 10;
const accountPasswordChecks = limiter('account-password', ACCOUNT_PASSWORD_CHECKS, WINDOW_SECONDS);

/** Takes one current-password check from the account's allowance, before the password is checked. */
export function consumeAccountPasswordCheck(userId: string): Promise<ThrottleResult> {
	return consumeAll([[accountPasswordChecks, userId]]);
}

/** Address changes asked for per account in a day (Tapline's choice): each one sends e-mail. */
export const EMAIL_CHANGE_REQUESTS = 5;
const emailChangeRequests = limiter('email-change', EMAIL_CHANGE_REQUESTS, 24 * 3600);

/** Takes one address-change request from the account's allowance. */
export function consumeEmailChangeRequest(userId: string): Promise<ThrottleResult> {
	return consumeAll([[emailChangeRequests, userId]]);
}

/**
 * Quotes sent or revised per installer in an hour (Tapline's choice: a busy installer quotes a
 * few dozen jobs a day; a script sending hundreds is stopped).
 */
export const QUOTE_SUBMISSIONS = 60;
const quoteSubmissions = limiter('quote-submit', QUOTE_SUBMISSIONS, 3600);

/** Takes one quote submission from the installer's allowance. */
export function consumeQuoteSubmission(installerId: string): Promise<ThrottleResult> {
	return consumeAll([[quoteSubmissions, installerId]]);
}

/**
 * Messages written per person in ten minutes, across threads (Tapline's choice: a conversation
 * is a few messages a minute at most; each message may send an e-mail).
 */
export const MESSAGES_PER_WINDOW = 60;
const messagesWritten = limiter('message-write', MESSAGES_PER_WINDOW, 600);

/** Takes one message from the author's allowance. */
export function consumeMessage(authorId: string): Promise<ThrottleResult> {
	return consumeAll([[messagesWritten, authorId]]);
}

/** A refusal's words for a throttled action, with the wait rounded up to whole minutes. */
export function slowDownMessage(what: string, retryAfterSeconds: number): string {
	const minutes = Math.max(1, Math.ceil(retryAfterSeconds / 60));
	return `You have sent a lot of ${what} in a short time. Please wait ${String(minutes)} minute${minutes === 1 ? '' : 's'} and try again.`;
}

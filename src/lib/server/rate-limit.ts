/**
 * Sign-in throttling with rate-limiter-flexible, its counters in PostgreSQL (table `rate_limit`,
 * created by our migrations) so that every app process shares them. At a larger scale the same
 * limiter classes run on Redis (RateLimiterRedis) without changing callers.
 */
import { RateLimiterPostgres, RateLimiterRes } from 'rate-limiter-flexible';
import { pool } from './db';

/** Wrong passwords allowed per account in the window before it is locked for the rest of it. */
export const ACCOUNT_ATTEMPTS = 5;
/** Attempts allowed per client address in the window, across accounts (password spraying). */
export const ADDRESS_ATTEMPTS = 20;
const WINDOW_SECONDS = 15 * 60;

const byAccount = new RateLimiterPostgres({
	storeClient: pool,
	storeType: 'pool',
	tableName: 'rate_limit',
	tableCreated: true,
	clearExpiredByTimeout: false,
	keyPrefix: 'signin-account',
	points: ACCOUNT_ATTEMPTS,
	duration: WINDOW_SECONDS
});

const byAddress = new RateLimiterPostgres({
	storeClient: pool,
	storeType: 'pool',
	tableName: 'rate_limit',
	tableCreated: true,
	clearExpiredByTimeout: false,
	keyPrefix: 'signin-address',
	points: ADDRESS_ATTEMPTS,
	duration: WINDOW_SECONDS
});

export type ThrottleResult = { allowed: true } | { allowed: false; retryAfterSeconds: number };

async function isBlocked(limiter: RateLimiterPostgres, key: string): Promise<number | null> {
	const res = await limiter.get(key);
	if (res && res.consumedPoints >= limiter.points) return Math.ceil(res.msBeforeNext / 1000);
	return null;
}

/** Tells whether a sign-in may be tried now for this account and address. */
export async function checkSignInAllowed(email: string, address: string): Promise<ThrottleResult> {
	const [account, client] = await Promise.all([
		isBlocked(byAccount, email.toLowerCase()),
		isBlocked(byAddress, address)
	]);
	const wait = Math.max(account ?? 0, client ?? 0);
	return account === null && client === null
		? { allowed: true }
		: { allowed: false, retryAfterSeconds: Math.max(wait, 1) };
}

/** Counts a failed sign-in against the account and the address. */
export async function recordFailedSignIn(email: string, address: string): Promise<void> {
	const swallowLimit = (err: unknown) => {
		if (!(err instanceof RateLimiterRes)) throw err;
	};
	await Promise.all([
		byAccount.consume(email.toLowerCase()).catch(swallowLimit),
		byAddress.consume(address).catch(swallowLimit)
	]);
}

/** Clears the account's counter after a successful sign-in (the address counter keeps running). */
export async function recordSuccessfulSignIn(email: string): Promise<void> {
	await byAccount.delete(email.toLowerCase());
}

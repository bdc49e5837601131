/**
 * Sessions, behind one small API. Lucia v3 is no longer developed upstream; nothing outside this
 * file imports it, so replacing it later touches only this module.
 */
import { createHash } from 'node:crypto';
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import type { Cookies } from '@sveltejs/kit';
import { and, asc, eq, gt, ne } from 'drizzle-orm';
import { Lucia } from 'lucia';
import { dev } from '$app/environment';
import { env } from '$env/dynamic/private';
import { db, type Tx } from './db';
import { session, user, type Role } from './db/schema';

const adapter = new DrizzlePostgreSQLAdapter(db, session, user);

/** Secure cookies whenever the app is served over HTTPS (production); plain HTTP only in dev or loopback demos. */
const secureCookies = env.ORIGIN ? env.ORIGIN.startsWith('https://') : !dev;

const lucia = new Lucia(adapter, {
	sessionExpiresIn: undefined,
	sessionCookie: {
		name: 'tapline_session',
		attributes: { secure: secureCookies, sameSite: 'lax' }
	},
	getUserAttributes: (attributes) => ({
		email: attributes.email,
		role: attributes.role,
		displayName: attributes.displayName,
		emailVerified: attributes.emailVerifiedAt !== null,
		suspended: attributes.suspendedAt !== null
	})
});

declare module 'lucia' {
	interface Register {
		Lucia: typeof lucia;
		DatabaseUserAttributes: {
			email: string;
			role: Role;
			displayName: string;
			emailVerifiedAt: Date | null;
			suspendedAt: Date | null;
		};
	}
}

/** The fields of the signed-in person that the app may use and send to the browser. */
export interface SessionUser {
	id: string;
	email: string;
	role: Role;
	displayName: string;
	emailVerified: boolean;
}

export interface SessionInfo {
	id: string;
	expiresAt: Date;
	fresh: boolean;
}

export const SESSION_COOKIE_NAME = lucia.sessionCookieName;

const SESSION_ID = /^[a-z0-9]{20,64}$/;

/** Starts a session for a user and sets its cookie (httpOnly, SameSite=Lax, Secure over HTTPS). */
export async function startSession(cookies: Cookies, userId: string): Promise<void> {
	const created = await lucia.createSession(userId, {});
	const cookie = lucia.createSessionCookie(created.id);
	cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.attributes });
}

/**
 * Reads the session cookie, validates it against the database and refreshes or clears the cookie.
 * Returns nulls when there is no valid session.
 */
export async function readSession(
	cookies: Cookies
): Promise<{ user: SessionUser | null; session: SessionInfo | null }> {
	const sessionId = cookies.get(SESSION_COOKIE_NAME);
	if (!sessionId) return { user: null, session: null };
	// Lucia's ids are 40 lower-case base32 characters: anything else (a NUL, which PostgreSQL
	// would refuse with a 500, or junk) is no session, and is never sent to the database.
	if (!SESSION_ID.test(sessionId)) {
		const blank = lucia.createBlankSessionCookie();
		cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
		return { user: null, session: null };
	}
	const result = await lucia.validateSession(sessionId);
	if (result.session?.fresh) {
		const cookie = lucia.createSessionCookie(result.session.id);
		cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.attributes });
	}
	if (result.session && result.user?.suspended) {
		// A suspension ends every session; one started since (by a confirmation link) ends here.
		await lucia.invalidateSession(result.session.id);
	}
	if (!result.session || !result.user || result.user.suspended) {
		const blank = lucia.createBlankSessionCookie();
		cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
		return { user: null, session: null };
	}
	const { id, email, role, displayName, emailVerified } = result.user;
	return {
		user: { id, email, role, displayName, emailVerified },
		session: {
			id: result.session.id,
			expiresAt: result.session.expiresAt,
			fresh: result.session.fresh
		}
	};
}

/** Ends one session and clears its cookie. */
export async function endSession(cookies: Cookies, sessionId: string): Promise<void> {
	await lucia.invalidateSession(sessionId);
	const blank = lucia.createBlankSessionCookie();
	cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
}

/**
 * Ends every session of a user inside the caller's transaction, so a suspension or forced reset
 * and the sign-out commit together.
 */
export async function endAllSessionsIn(tx: Tx, userId: string): Promise<void> {
	await tx.delete(session).where(eq(session.userId, userId));
}

/** Ends every session of a user, e.g. after a password reset. */
export async function endAllSessions(userId: string): Promise<void> {
	await lucia.invalidateUserSessions(userId);
}

/**
 * A session's id is its cookie's value, so pages never see it: they name a session by this
 * handle (SHA-256 of the id, shortened), which cannot be turned back into a cookie.
 */
export const sessionHandle = (sessionId: string) =>
	createHash('sha256').update(sessionId).digest('hex').slice(0, 32);

/** One of a user's sessions as the account page lists it. */
export interface SessionListing {
	handle: string;
	createdAt: Date;
	expiresAt: Date;
	current: boolean;
}

/** A user's sessions that have not run out, oldest first, marking the one making the request. */
export async function listSessions(
	userId: string,
	currentSessionId: string
): Promise<SessionListing[]> {
	const rows = await db
		.select({ id: session.id, createdAt: session.createdAt, expiresAt: session.expiresAt })
		.from(session)
		.where(and(eq(session.userId, userId), gt(session.expiresAt, new Date())))
		.orderBy(asc(session.createdAt), asc(session.id));
	return rows.map((row) => ({
		handle: sessionHandle(row.id),
		createdAt: row.createdAt,
		expiresAt: row.expiresAt,
		current: row.id === currentSessionId
	}));
}

/**
 * Ends one of the user's sessions, named by its handle; never the current one (that is signing
 * out) and never another user's.
 * @returns 'ended', 'current' when the handle names the session making the request, or 'unknown'
 */
export async function endSessionByHandle(
	userId: string,
	handle: string,
	currentSessionId: string
): Promise<'ended' | 'current' | 'unknown'> {
	const rows = await db.select({ id: session.id }).from(session).where(eq(session.userId, userId));
	const found = rows.find((row) => sessionHandle(row.id) === handle);
	if (!found) return 'unknown';
	if (found.id === currentSessionId) return 'current';
	await lucia.invalidateSession(found.id);
	return 'ended';
}

/**
 * Ends every session of the user except `keepSessionId` (all of them when null), inside the
 * caller's transaction when given one, so a password change and the sign-outs it causes commit
 * together.
 * @returns how many sessions ended
 */
export async function endSessionsExcept(
	userId: string,
	keepSessionId: string | null,
	tx: Tx | typeof db = db
): Promise<number> {
	const ended = await tx
		.delete(session)
		.where(
			keepSessionId
				? and(eq(session.userId, userId), ne(session.id, keepSessionId))
				: eq(session.userId, userId)
		)
		.returning({ id: session.id });
	return ended.length;
}

/** Clears the session cookie of this browser (after its session was ended some other way). */
export function clearSessionCookie(cookies: Cookies): void {
	const blank = lucia.createBlankSessionCookie();
	cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
}

/**
 * Sessions, behind one small API. Lucia v3 is no longer developed upstream; nothing outside this
 * file imports it, so replacing it later touches only this module.
 */
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import type { Cookies } from '@sveltejs/kit';
import { Lucia } from 'lucia';
import { dev } from '$app/environment';
import { env } from '$env/dynamic/private';
import { eq } from 'drizzle-orm';
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

import { error, redirect } from '@sveltejs/kit';
import { getRequestEvent } from '$app/server';
import type { SessionInfo, SessionUser } from '../auth';
import type { Role } from '../db/schema';
import { REDIRECT_TO_MAX_LENGTH } from '$lib/forms/auth';

/** URL areas and who may enter them; checked in hooks for every request, actions included. */
export const ROLE_AREAS: ReadonlyArray<{ prefix: string; role: Role }> = [
	{ prefix: '/owner', role: 'owner' },
	{ prefix: '/installer', role: 'installer' },
	{ prefix: '/admin', role: 'admin' }
];

/**
 * A path as generously as any router might read it: percent-decoded until it stops changing
 * (so `%6f` and `%256f` become `o`), backslashes as slashes, dot segments resolved, repeated
 * slashes collapsed, lower case. Used to decide role areas, so no spelling of `/owner/...`
 * reaches a page the router would serve without passing the guard.
 */
export function normalisePath(pathname: string): string {
	let decoded = pathname;
	for (let i = 0; i < 5; i++) {
		let next: string;
		try {
			next = decodeURIComponent(decoded);
		} catch {
			break; // a malformed escape: keep what decoded so far
		}
		if (next === decoded) break;
		decoded = next;
	}
	const slashes = (p: string) => p.replace(/[\\/]+/g, '/');
	// URL resolves `.` and `..` segments; `?` and `#` stay part of the path.
	const url = new URL(slashes(decoded).replace(/[?#]/g, encodeURIComponent), 'http://path.invalid');
	return slashes(url.pathname).toLowerCase();
}

/** The area a path belongs to, if any, however the path is spelled. */
export function areaFor(pathname: string) {
	const path = normalisePath(pathname);
	return ROLE_AREAS.find((a) => path === a.prefix || path.startsWith(`${a.prefix}/`));
}

/**
 * Where to send a visitor with no session: the sign-in page, returning here afterwards. A return
 * path longer than the sign-in form takes loses its query, or is left out: the form would refuse
 * it (a hidden field the person cannot fix), and a huge Location header breaks some clients.
 */
export function signInUrl(url: URL) {
	const back = [url.pathname + url.search, url.pathname].find(
		(path) => path.length <= REDIRECT_TO_MAX_LENGTH
	);
	return back ? `/sign-in?${new URLSearchParams({ redirectTo: back }).toString()}` : '/sign-in';
}

/**
 * As {@link requireRole}, for actions that need a confirmed e-mail address (posting a job,
 * booking, messaging, applying): an unconfirmed user goes to the confirmation page, which says
 * why and offers a new link.
 */
export function requireConfirmedRole(...roles: Role[]): SessionUser {
	const user = requireRole(...roles);
	if (!user.emailVerified) redirect(303, '/verify-email?needed=1');
	return user;
}

/**
 * The signed-in user, if they hold one of the roles; otherwise redirects to sign-in (no session)
 * or fails with 403 (wrong role). Call it at the top of every load and action that needs a role.
 */
export function requireRole(...roles: Role[]): SessionUser {
	const { locals, url } = getRequestEvent();
	if (!locals.user) redirect(303, signInUrl(url));
	if (roles.length > 0 && !roles.includes(locals.user.role)) {
		error(403, 'This part of Tapline is for another kind of account.');
	}
	return locals.user;
}

/**
 * As {@link requireRole} for any signed-in person, with the session making the request (the
 * account page marks it and never ends it from the list).
 */
export function requireSession(): { user: SessionUser; session: SessionInfo } {
	const user = requireRole();
	const { locals } = getRequestEvent();
	if (!locals.session) error(401, 'Sign in again to continue.');
	return { user, session: locals.session };
}

/** The home page of each role. */
export const homeFor = (role: Role) => `/${role}`;

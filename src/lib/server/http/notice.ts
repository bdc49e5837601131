/**
 * Success notices that are read once: an action stores a short message in a cookie and
 * redirects; the next page load (the root layout's) shows it and clears the cookie, so a reload
 * or a bookmark never shows it again. Works with and without JavaScript (an enhanced form's
 * redirect reloads every load).
 */
import { redirect, type Cookies } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';

const COOKIE = 'tapline_notice';
const MAX_LENGTH = 400;

/** Stores a notice for the next page and redirects there (303). */
export function redirectWithNotice(cookies: Cookies, location: string, notice: string): never {
	cookies.set(COOKIE, notice.slice(0, MAX_LENGTH), {
		path: '/',
		httpOnly: true,
		sameSite: 'lax',
		// As the session cookie: Secure when the site is served over https.
		secure: env.ORIGIN?.startsWith('https://') ?? false,
		maxAge: 60
	});
	redirect(303, location);
}

/** The waiting notice, if any, cleared as it is read. */
export function takeNotice(cookies: Cookies): string | null {
	const notice = cookies.get(COOKIE);
	if (notice === undefined) return null;
	cookies.delete(COOKIE, { path: '/' });
	return notice.slice(0, MAX_LENGTH) || null;
}

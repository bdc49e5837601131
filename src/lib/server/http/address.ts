/**
 * Addresses the hooks refuse before any route runs. SvelteKit (2.70) decodes the path with
 * `decodeURI`; when that fails (a broken %-encoding such as `%FF` or `%C3%28`) it still runs the
 * `handle` hook, but outside its own error handling, so a hook that throws `error()` or
 * `redirect()` for such a path leaves a rejected promise that stops the whole Node process. The
 * hooks therefore answer these paths themselves, with a Response, and never throw for them.
 */

/** Shown for a path that cannot be decoded. */
export const UNREADABLE_ADDRESS_MESSAGE =
	'This address has characters Tapline cannot read. Check the link and try again.';

/**
 * The path decoded the way SvelteKit decodes it (`%25` kept, the rest `decodeURI`), or null when
 * it cannot be. The decoded text is returned, not only checked: the bundler treats `decodeURI`
 * as free of side effects and drops a call whose result is unused, throw and all.
 */
export function decodedPath(pathname: string): string | null {
	try {
		return pathname
			.split('%25')
			.map((part) => decodeURI(part))
			.join('%25');
	} catch {
		return null;
	}
}

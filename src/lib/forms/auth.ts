import { z } from 'zod';
import { textField } from './fields';

/**
 * Where to go after signing in: only a path on this site, so a sign-in link cannot bounce a person
 * to another one. The target is parsed with `URL` against our own origin, as a browser would read
 * the Location header (tabs and newlines dropped, backslashes as slashes, `//host` as another
 * host), and kept only when the result is still on `origin`; it comes back re-serialised (path,
 * query, fragment), so no control character reaches a header.
 */
export function safeRedirect(target: string | null | undefined, origin: string, fallback = '/') {
	if (!target || !target.startsWith('/')) return fallback;
	let url: URL;
	try {
		url = new URL(target, origin);
	} catch {
		return fallback;
	}
	if (url.origin !== new URL(origin).origin) return fallback;
	// `new URL('/..//evil.example/x', origin).pathname` is `//evil.example/x`, which a browser reads
	// as another host: accept only one leading slash followed by anything but a slash or backslash.
	if (!/^\/(?![/\\])/.test(url.pathname)) return fallback;
	return url.pathname + url.search + url.hash;
}

const email = textField({ error: 'Enter your e-mail address' })
	.trim()
	.min(1, 'Enter your e-mail address')
	.max(254, 'That e-mail address is too long')
	.pipe(z.email({ error: 'That does not look like an e-mail address (name@example.com)' }));

// NIST SP 800-63B: at least 8 characters for user-chosen secrets; we ask 10, and cap the length
// so the hash cannot be used to burn CPU.
const newPassword = textField({ error: 'Choose a password' })
	.min(10, 'Use at least 10 characters')
	.max(128, 'Use at most 128 characters');

export const signUpSchema = z.object({
	role: z.enum(['owner', 'installer'], { error: 'Choose whether you need a fit or do fits' }),
	displayName: textField({ error: 'Tell us your name' })
		.trim()
		.min(2, 'Tell us your name (at least 2 characters)')
		.max(60, 'Keep your name under 60 characters'),
	email,
	password: newPassword
});

/** The longest sign-in return path the form takes; longer ones are not offered (guards.ts). */
export const REDIRECT_TO_MAX_LENGTH = 500;

export const signInSchema = z.object({
	email,
	password: textField({ error: 'Enter your password' }).min(1, 'Enter your password').max(128),
	redirectTo: textField().max(REDIRECT_TO_MAX_LENGTH).optional()
});

export const forgotPasswordSchema = z.object({ email });

export const resetPasswordSchema = z
	.object({
		token: textField().min(10, 'This reset link is incomplete').max(200),
		password: newPassword,
		confirmPassword: textField({ error: 'Type the password again' })
	})
	.refine((v) => v.password === v.confirmPassword, {
		path: ['confirmPassword'],
		message: 'The two passwords differ'
	});

export const adminInviteSchema = z.object({
	displayName: textField()
		.trim()
		.min(2, 'Enter their name')
		.max(60, 'Keep the name under 60 characters'),
	email
});

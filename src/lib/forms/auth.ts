import { z } from 'zod';

/** Accepts only same-site paths, so a sign-in link cannot bounce a person to another site. */
export const safeRedirect = (target: string | null | undefined, fallback = '/') =>
	target && target.startsWith('/') && !target.startsWith('//') && !target.startsWith('/\\')
		? target
		: fallback;

const email = z
	.string({ error: 'Enter your e-mail address' })
	.trim()
	.min(1, 'Enter your e-mail address')
	.max(254, 'That e-mail address is too long')
	.pipe(z.email({ error: 'That does not look like an e-mail address (name@example.com)' }));

// NIST SP 800-63B: at least 8 characters for user-chosen secrets; we ask 10, and cap the length
// so the hash cannot be used to burn CPU.
const newPassword = z
	.string({ error: 'Choose a password' })
	.min(10, 'Use at least 10 characters')
	.max(128, 'Use at most 128 characters');

export const signUpSchema = z.object({
	role: z.enum(['owner', 'installer'], { error: 'Choose whether you need a fit or do fits' }),
	displayName: z
		.string({ error: 'Tell us your name' })
		.trim()
		.min(2, 'Tell us your name (at least 2 characters)')
		.max(60, 'Keep your name under 60 characters'),
	email,
	password: newPassword
});

export const signInSchema = z.object({
	email,
	password: z.string({ error: 'Enter your password' }).min(1, 'Enter your password').max(128),
	redirectTo: z.string().max(500).optional()
});

export const forgotPasswordSchema = z.object({ email });

export const resetPasswordSchema = z
	.object({
		token: z.string().min(10, 'This reset link is incomplete').max(200),
		password: newPassword,
		confirmPassword: z.string({ error: 'Type the password again' })
	})
	.refine((v) => v.password === v.confirmPassword, {
		path: ['confirmPassword'],
		message: 'The two passwords differ'
	});

export const adminInviteSchema = z.object({
	displayName: z
		.string()
		.trim()
		.min(2, 'Enter their name')
		.max(60, 'Keep the name under 60 characters'),
	email
});

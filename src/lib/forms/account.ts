import { z } from 'zod';
import { textField } from './fields';

const displayName = textField({ error: 'Tell us your name' })
	.trim()
	.min(2, 'Tell us your name (at least 2 characters)')
	.max(60, 'Keep your name under 60 characters');

const currentPassword = textField({ error: 'Enter your current password' })
	.min(1, 'Enter your current password')
	.max(128, 'That is longer than any Tapline password');

export const displayNameSchema = z.object({ displayName });

// Each form names its password field differently: the page holds three, and a field's id comes
// from its name.
export const emailChangeSchema = z.object({
	newEmail: textField({ error: 'Enter the new address' })
		.trim()
		.min(1, 'Enter the new address')
		.max(254, 'That e-mail address is too long')
		.pipe(z.email({ error: 'That does not look like an e-mail address (name@example.com)' })),
	passwordForEmail: currentPassword
});

// NIST SP 800-63B: at least 8 characters for user-chosen secrets; Tapline asks 10 (as sign-up).
export const passwordChangeSchema = z
	.object({
		currentPassword,
		newPassword: textField({ error: 'Choose a new password' })
			.min(10, 'Use at least 10 characters')
			.max(128, 'Use at most 128 characters'),
		confirmPassword: textField({ error: 'Type the new password again' })
	})
	.refine((v) => v.newPassword === v.confirmPassword, {
		path: ['confirmPassword'],
		message: 'The two new passwords differ'
	});

export const endSessionSchema = z.object({
	session: z.string().regex(/^[0-9a-f]{32}$/, 'That session cannot be found.')
});

export const closeAccountSchema = z.object({
	passwordToClose: currentPassword,
	confirm: z.boolean().refine((v) => v, {
		message: 'Tick the box to say you understand what closing the account does.'
	})
});

export const confirmEmailChangeSchema = z.object({ token: textField().min(10).max(200) });

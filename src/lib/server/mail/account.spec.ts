import { describe, expect, it } from 'vitest';
import { isAccountEmail, renderAccountEmail } from './account';

describe('account e-mails', () => {
	it('puts the confirmation link for a new address in both parts', () => {
		const url = 'http://tapline.test/account/email?token=abc123';
		const mail = renderAccountEmail({
			template: 'email-change-confirm',
			data: { displayName: 'Robin', url }
		});
		expect(mail.subject).toBe('Confirm your new e-mail address for Tapline');
		expect(mail.text).toContain(url);
		expect(mail.html).toContain(url);
		expect(mail.text).toContain('old address stays');
	});

	it('tells a taken address nothing about who asked, and gives it no link to use', () => {
		const mail = renderAccountEmail({
			template: 'email-change-existing',
			data: { signInUrl: 'http://tapline.test/sign-in' }
		});
		expect(mail.text).not.toMatch(/token=/);
		expect(mail.text).toContain('We changed nothing');
	});

	it('names the new address in the notices to the old one', () => {
		for (const template of ['email-change-requested', 'email-changed'] as const) {
			const mail = renderAccountEmail({
				template,
				data: { displayName: 'Robin', newEmail: 'robin.new@example.test' }
			});
			expect(mail.text, template).toContain('robin.new@example.test');
		}
	});

	it('claims only its own templates', () => {
		expect(isAccountEmail({ template: 'password-changed' })).toBe(true);
		expect(isAccountEmail({ template: 'verify-email' })).toBe(false);
	});
});

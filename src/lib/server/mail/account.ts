/**
 * E-mails about a person's own account: a new address to confirm, notices to the old address,
 * a changed password and a closed account. Each renders a subject, an HTML part and a plain-text
 * part from the same words, in the house layout of layout.ts.
 */
import { renderBlock, type RenderedEmail } from './layout';

export type AccountEmail =
	| { template: 'email-change-confirm'; data: { displayName: string; url: string } }
	| { template: 'email-change-existing'; data: { signInUrl: string } }
	| { template: 'email-change-requested'; data: { displayName: string; newEmail: string } }
	| { template: 'email-changed'; data: { displayName: string; newEmail: string } }
	| { template: 'password-changed'; data: { displayName: string; resetUrl: string } }
	| { template: 'account-closed'; data: { displayName: string } };

/** Renders one of the account e-mails. */
export function renderAccountEmail(message: AccountEmail): RenderedEmail {
	switch (message.template) {
		case 'email-change-confirm':
			return renderBlock('Confirm your new e-mail address for Tapline', {
				heading: `Hi ${message.data.displayName}, is this your new address?`,
				paragraphs: [
					'You asked Tapline to send your e-mail to this address from now on. Confirm it, and quotes, bookings and receipts come here.',
					'Until you confirm, your old address stays the one you sign in with.'
				],
				action: { label: 'Use this address', url: message.data.url },
				footnote: 'The link works for 48 hours. If you did not ask for this, ignore this message.'
			});
		case 'email-change-existing':
			return renderBlock('Someone asked to move a Tapline account to your address', {
				heading: 'This address already has a Tapline account',
				paragraphs: [
					'Someone (perhaps you) asked to move a Tapline account to this e-mail address, which already belongs to an account. We changed nothing: each address belongs to one account.',
					'If you meant to move your other account here, close or re-address this one first.'
				],
				action: { label: 'Sign in', url: message.data.signInUrl },
				footnote: 'If it was not you, ignore this message: your account stays as it is.'
			});
		case 'email-change-requested':
			return renderBlock('Your Tapline e-mail address is about to change', {
				heading: `Hi ${message.data.displayName}, a change of address was asked for`,
				paragraphs: [
					`Your account asked to use ${message.data.newEmail} from now on. We sent a link there; nothing changes until it is opened.`,
					'If this was not you, sign in and change your password: that also signs out every other device.'
				]
			});
		case 'email-changed':
			return renderBlock('Your Tapline e-mail address changed', {
				heading: `Hi ${message.data.displayName}, your account has a new address`,
				paragraphs: [
					`Your Tapline account now uses ${message.data.newEmail}. This address gets no more messages from us.`,
					'If you did not make this change, reply to this e-mail at once so the admin team can help.'
				]
			});
		case 'password-changed':
			return renderBlock('Your Tapline password changed', {
				heading: `Hi ${message.data.displayName}, your password is new`,
				paragraphs: [
					'The password of your Tapline account was changed, and every other device was signed out.',
					'If this was not you, choose a new password with a reset link at once.'
				],
				action: { label: 'Reset my password', url: message.data.resetUrl }
			});
		case 'account-closed':
			return renderBlock('Your Tapline account is closed', {
				heading: `Goodbye, ${message.data.displayName}`,
				paragraphs: [
					'Your Tapline account is closed and every device is signed out. Your name, e-mail address and password are gone from it.',
					'What others rely on stays on file without your name: past bookings, quotes, messages and, for installers, the vetting record.'
				]
			});
	}
}

const ACCOUNT_TEMPLATES = new Set<string>([
	'email-change-confirm',
	'email-change-existing',
	'email-change-requested',
	'email-changed',
	'password-changed',
	'account-closed'
]);

/** Whether a message is one of the account e-mails, so renderEmail can hand it over. */
export function isAccountEmail(message: { template: string }): message is AccountEmail {
	return ACCOUNT_TEMPLATES.has(message.template);
}

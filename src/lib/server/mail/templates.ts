/**
 * E-mail templates. Each renders a subject, an HTML part and a plain-text part from the same words,
 * so a message reads the same in any mail client.
 */
import { isAccountEmail, renderAccountEmail, type AccountEmail } from './account';
import { isMarketplaceEmail, renderMarketplaceEmail, type MarketplaceEmail } from './marketplace';
import { isPaymentEmail, renderPaymentEmail, type PaymentEmail } from './payments';
import { isCompletionEmail, renderCompletionEmail, type CompletionEmail } from './completion';
import { isDisputeEmail, renderDisputeEmail, type DisputeEmail } from './disputes';
import { isScheduleEmail, renderScheduleEmail, type ScheduleEmail } from './schedule';
import { isReviewEmail, renderReviewEmail, type ReviewEmail } from './reviews';

import { renderBlock, type RenderedEmail } from './layout';

export type { RenderedEmail };

export type EmailTemplate =
	| { template: 'verify-email'; data: { displayName: string; url: string } }
	| { template: 'reset-password'; data: { displayName: string; url: string } }
	| { template: 'account-suspended'; data: { displayName: string; reason: string } }
	| { template: 'account-reinstated'; data: { displayName: string; url: string } }
	| { template: 'password-reset-by-admin'; data: { displayName: string; url: string } }
	| { template: 'sign-up-existing'; data: { signInUrl: string; resetUrl: string } }
	| {
			template: 'email-undeliverable';
			data: { displayName: string; to: string; subject: string; reason: string };
	  }
	| { template: 'admin-invite'; data: { displayName: string; invitedBy: string; url: string } }
	| { template: 'vetting-received'; data: VettingMailData }
	| { template: 'vetting-more-info'; data: VettingMailData & { message: string } }
	| { template: 'vetting-approved'; data: VettingMailData }
	| { template: 'vetting-rejected'; data: VettingMailData & { reason: string } }
	| { template: 'vetting-suspended'; data: VettingMailData & { reason: string } }
	| { template: 'vetting-reinstated'; data: VettingMailData }
	| {
			template: 'insurance-reminder';
			data: VettingMailData & { expiresOn: string; daysBefore: number };
	  }
	| { template: 'insurance-paused'; data: VettingMailData & { reason: string } }
	| { template: 'insurance-approved'; data: VettingMailData }
	| {
			template: 'quote-withdrawn-suspended';
			data: { displayName: string; businessName: string; title: string; url: string };
	  }
	| MarketplaceEmail
	| AccountEmail
	| PaymentEmail
	| CompletionEmail
	| DisputeEmail
	| ScheduleEmail
	| ReviewEmail;

/** What every vetting e-mail needs: whom it greets and where their status page is. */
export interface VettingMailData {
	displayName: string;
	businessName: string;
	url: string;
}

/** 'YYYY-MM-DD' as '4 October 2026'; the date is a calendar date, so no zone applies. */
const formatDay = (day: string) =>
	new Date(`${day}T00:00:00Z`).toLocaleDateString('en-AU', {
		day: 'numeric',
		month: 'long',
		year: 'numeric',
		timeZone: 'UTC'
	});

/** Renders one of Tapline's e-mails. */
export function renderEmail(message: EmailTemplate): RenderedEmail {
	if (isMarketplaceEmail(message)) return renderMarketplaceEmail(message);
	if (isAccountEmail(message)) return renderAccountEmail(message);
	if (isPaymentEmail(message)) return renderPaymentEmail(message);
	if (isCompletionEmail(message)) return renderCompletionEmail(message);
	if (isDisputeEmail(message)) return renderDisputeEmail(message);
	if (isScheduleEmail(message)) return renderScheduleEmail(message);
	if (isReviewEmail(message)) return renderReviewEmail(message);
	switch (message.template) {
		case 'verify-email':
			return renderBlock('Confirm your e-mail address for Tapline', {
				heading: `Hi ${message.data.displayName}, please confirm your address`,
				paragraphs: [
					'You signed up to Tapline. Confirm this e-mail address so we can send you quotes, bookings and receipts.'
				],
				action: { label: 'Confirm my address', url: message.data.url },
				footnote: 'The link works for 48 hours. If you did not sign up, ignore this message.'
			});
		case 'reset-password':
			return renderBlock('Reset your Tapline password', {
				heading: `Hi ${message.data.displayName}, here is your reset link`,
				paragraphs: [
					'Someone (hopefully you) asked to reset the password of this Tapline account.',
					'Choosing a new password signs the account out everywhere else.'
				],
				action: { label: 'Choose a new password', url: message.data.url },
				footnote:
					'The link works for one hour and only once. If you did not ask, ignore this message: your password stays as it is.'
			});
		case 'account-suspended':
			return renderBlock('Your Tapline account is suspended', {
				heading: `Hi ${message.data.displayName}, your account is suspended`,
				paragraphs: [
					`A Tapline admin suspended this account: ${message.data.reason}`,
					'You are signed out and cannot sign in while it lasts. Open quotes were withdrawn and the owners told; bookings already made stay as they are while we sort this out with you.',
					'Reply to this e-mail to talk it through with us.'
				]
			});
		case 'account-reinstated':
			return renderBlock('Your Tapline account is active again', {
				heading: `Welcome back, ${message.data.displayName}`,
				paragraphs: [
					'A Tapline admin lifted the suspension of this account. You can sign in again.'
				],
				action: { label: 'Sign in', url: message.data.url }
			});
		case 'password-reset-by-admin':
			return renderBlock('Choose a new Tapline password', {
				heading: `Hi ${message.data.displayName}, please choose a new password`,
				paragraphs: [
					'A Tapline admin asked for a new password on this account, for its safety: you are signed out everywhere and the old password no longer works.',
					'Choose a new one with the link below.'
				],
				action: { label: 'Choose a new password', url: message.data.url },
				footnote:
					'The link works for one hour and only once; after that, use "Forgot password" on the sign-in page.'
			});
		case 'sign-up-existing':
			return renderBlock('Someone tried to sign up to Tapline with your address', {
				heading: 'You already have a Tapline account',
				paragraphs: [
					'Someone (perhaps you) tried to create a Tapline account with this e-mail address, which already has one. We did not create a second account or change anything.',
					'If it was you, sign in instead. If you do not remember the password, reset it from the sign-in page.'
				],
				action: { label: 'Sign in', url: message.data.signInUrl },
				footnote: `Forgot your password? Choose a new one: ${message.data.resetUrl}. If it was not you, ignore this message: your account stays as it is.`
			});
		case 'email-undeliverable':
			return renderBlock(`An e-mail to ${message.data.to} could not be delivered`, {
				heading: `Hi ${message.data.displayName}, one message was refused for good`,
				paragraphs: [
					`The receiving mail server permanently refused “${message.data.subject}” to ${message.data.to}, so Tapline will not try it again.`,
					`It said: ${message.data.reason}`,
					'Check the address with the person (it may be mistyped or closed) and help them update it.'
				]
			});
		case 'admin-invite':
			return renderBlock('You have been made a Tapline admin', {
				heading: `Hi ${message.data.displayName}, welcome to the admin team`,
				paragraphs: [
					`${message.data.invitedBy} created an admin account for you on Tapline.`,
					'Set your password to sign in. Admins vet installers, settle disputes and watch held funds.'
				],
				action: { label: 'Set my password', url: message.data.url },
				footnote:
					'The link works for one hour. Ask for a new one from the sign-in page if it runs out.'
			});
		case 'vetting-received':
			return renderBlock('We have your installer application', {
				heading: `Thanks ${message.data.displayName}, your application is in`,
				paragraphs: [
					`An admin will check the ABN, insurance and photo ID for ${message.data.businessName}, usually within two working days.`,
					'We will e-mail you when there is a decision or if we need anything else.'
				],
				action: { label: 'See where it stands', url: message.data.url }
			});
		case 'vetting-more-info':
			return renderBlock('We need a little more for your application', {
				heading: `Hi ${message.data.displayName}, one more thing before we decide`,
				paragraphs: [
					`The admin checking ${message.data.businessName} wrote:`,
					message.data.message,
					'Add what is asked on your status page, then send the application again.'
				],
				action: { label: 'Open my application', url: message.data.url }
			});
		case 'vetting-approved':
			return renderBlock('You are vetted on Tapline', {
				heading: `Welcome aboard, ${message.data.displayName}`,
				paragraphs: [
					`${message.data.businessName} is now a vetted installer. Your profile shows the vetted badge, and jobs in your service area are open to your quotes.`,
					'Keep your insurance current: we remind you 30 and 7 days before it expires.'
				],
				action: { label: 'Go to my work', url: message.data.url }
			});
		case 'vetting-rejected':
			return renderBlock('Your installer application was not approved', {
				heading: `Hi ${message.data.displayName}, we could not approve this application`,
				paragraphs: [
					`The admin who reviewed ${message.data.businessName} gave this reason:`,
					message.data.reason,
					'Reply to this e-mail if you think something was misread.'
				],
				action: { label: 'See my application', url: message.data.url }
			});
		case 'vetting-suspended':
			return renderBlock('Your Tapline installer account is suspended', {
				heading: `Hi ${message.data.displayName}, quoting is suspended`,
				paragraphs: [
					`An admin suspended ${message.data.businessName} for this reason:`,
					message.data.reason,
					'Reply to this e-mail if you want to talk it through with the admin team.'
				],
				action: { label: 'See my status', url: message.data.url }
			});
		case 'vetting-reinstated':
			return renderBlock('Your Tapline installer account is active again', {
				heading: `Good news, ${message.data.displayName}`,
				paragraphs: [
					`An admin lifted the suspension on ${message.data.businessName}. You can quote on jobs again.`
				],
				action: { label: 'Go to my work', url: message.data.url }
			});
		case 'insurance-reminder':
			return renderBlock(`Your insurance expires in ${message.data.daysBefore} days`, {
				heading: `Hi ${message.data.displayName}, time to renew your cover`,
				paragraphs: [
					`The public liability certificate on file for ${message.data.businessName} runs out on ${formatDay(message.data.expiresOn)}.`,
					'Upload the renewed certificate and its details before then. If it lapses, quoting pauses until an admin approves the new one.'
				],
				action: { label: 'Upload my new certificate', url: message.data.url }
			});
		case 'insurance-paused':
			return renderBlock('Quoting is paused on Tapline', {
				heading: `Hi ${message.data.displayName}, your quoting is paused`,
				paragraphs: [
					message.data.reason,
					`Once an admin approves a current certificate for ${message.data.businessName}, quoting starts again by itself.`
				],
				action: { label: 'Upload my certificate', url: message.data.url }
			});
		case 'insurance-approved':
			return renderBlock('Your new insurance is approved', {
				heading: `Thanks ${message.data.displayName}, you can quote again`,
				paragraphs: [
					`An admin checked the new certificate for ${message.data.businessName}. The pause is lifted.`
				],
				action: { label: 'Go to my work', url: message.data.url }
			});
		case 'quote-withdrawn-suspended':
			return renderBlock(`A quote for your ${message.data.title} was withdrawn`, {
				heading: `Hi ${message.data.displayName}, one quote is no longer open`,
				paragraphs: [
					`${message.data.businessName} can no longer take work through Tapline, so we withdrew their quote for your ${message.data.title}.`,
					'Your job stays open to the other vetted installers in your area; their quotes are unchanged.'
				],
				action: { label: 'See my quotes', url: message.data.url }
			});
	}
}

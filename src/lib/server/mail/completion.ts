/**
 * E-mails about finishing a booking: the fit is reported (the owner's window opens), and the work
 * is confirmed (by the owner, or by the window closing) with the held funds on their way.
 */
import { renderBlock as render, type RenderedEmail } from './layout';

export type CompletionEmail =
	| {
			template: 'fit-reported-owner';
			data: {
				displayName: string;
				title: string;
				businessName: string;
				confirmBy: string;
				url: string;
			};
	  }
	| {
			template: 'work-confirmed';
			data: { greeting: string; title: string; lines: string[]; url: string };
	  };

const TEMPLATES = new Set<string>(['fit-reported-owner', 'work-confirmed']);

/** Whether a message is one of these. */
export function isCompletionEmail(message: { template: string }): message is CompletionEmail {
	return TEMPLATES.has(message.template);
}

/** Renders one of the completion e-mails. */
export function renderCompletionEmail(message: CompletionEmail): RenderedEmail {
	switch (message.template) {
		case 'fit-reported-owner':
			return render(`Fitted: ${message.data.title}. Please check and confirm`, {
				heading: `Hi ${message.data.displayName}, ${message.data.businessName} has finished`,
				paragraphs: [
					`${message.data.businessName} filed the fit report for the ${message.data.title}. Your install record, with the circuits used and photos, is on the booking page.`,
					`Please check the work: switch the ignition on and off and see that the camera records and goes into parking mode. Then confirm it, or raise a problem, by ${message.data.confirmBy}.`,
					'If we hear nothing by then, the work counts as confirmed and the held funds are paid to the installer.'
				],
				action: { label: 'Check and confirm', url: message.data.url }
			});
		case 'work-confirmed':
			return render(`Confirmed: ${message.data.title}`, {
				heading: message.data.greeting,
				paragraphs: message.data.lines,
				action: { label: 'See the booking', url: message.data.url }
			});
	}
}

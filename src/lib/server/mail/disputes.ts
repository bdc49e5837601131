/**
 * E-mails about a dispute: the installer is told a problem was raised, each side is told when the
 * other adds to the timeline, and both are told how an admin settled it and what it means for
 * the held funds.
 */
import { renderBlock as render, type RenderedEmail } from './layout';

export type DisputeEmail =
	| {
			template: 'dispute-opened';
			data: {
				businessName: string;
				title: string;
				reason: string;
				description: string;
				url: string;
			};
	  }
	| {
			template: 'dispute-added';
			data: { greeting: string; title: string; who: string; body: string; url: string };
	  }
	| {
			template: 'dispute-settled';
			data: { greeting: string; title: string; lines: string[]; note: string; url: string };
	  };

const TEMPLATES = new Set<string>(['dispute-opened', 'dispute-added', 'dispute-settled']);

/** Whether a message is one of these. */
export function isDisputeEmail(message: { template: string }): message is DisputeEmail {
	return TEMPLATES.has(message.template);
}

/** Renders one of the dispute e-mails. */
export function renderDisputeEmail(message: DisputeEmail): RenderedEmail {
	switch (message.template) {
		case 'dispute-opened':
			return render(`A problem was raised: ${message.data.title}`, {
				heading: `${message.data.businessName}, the owner raised a problem`,
				paragraphs: [
					`The owner of the ${message.data.title} raised a problem with the work: ${message.data.reason}.`,
					`In their words: “${message.data.description}”`,
					'The held funds stay held while a Tapline admin looks at it. Please answer with your side and any photos from the fit; both of you see the same timeline.'
				],
				action: { label: 'Answer with your evidence', url: message.data.url }
			});
		case 'dispute-added':
			return render(`New on the dispute: ${message.data.title}`, {
				heading: message.data.greeting,
				paragraphs: [`${message.data.who} added to the timeline:`, `“${message.data.body}”`],
				action: { label: 'See the timeline', url: message.data.url }
			});
		case 'dispute-settled':
			return render(`Settled: ${message.data.title}`, {
				heading: message.data.greeting,
				paragraphs: [...message.data.lines, `From the Tapline admin: “${message.data.note}”`],
				action: { label: 'See the outcome', url: message.data.url },
				footnote: 'A settled dispute is final and cannot be reopened.'
			});
	}
}

/**
 * E-mails about reviews: the other side has reviewed you (theirs shows once you review or on a
 * date), and both reviews now show.
 */
import { renderBlock as render, type RenderedEmail } from './layout';

export type ReviewEmail =
	| {
			template: 'review-received';
			data: {
				displayName: string;
				authorName: string;
				title: string;
				/** When their review shows if this reader does not review first, in words. */
				visibleOn: string;
				url: string;
			};
	  }
	| {
			template: 'reviews-visible';
			data: { displayName: string; title: string; url: string };
	  };

const TEMPLATES = new Set<string>(['review-received', 'reviews-visible']);

/** Whether a message is one of these. */
export function isReviewEmail(message: { template: string }): message is ReviewEmail {
	return TEMPLATES.has(message.template);
}

/** Renders one of the review e-mails. */
export function renderReviewEmail(message: ReviewEmail): RenderedEmail {
	switch (message.template) {
		case 'review-received':
			return render(`${message.data.authorName} reviewed the ${message.data.title}`, {
				heading: `Hi ${message.data.displayName}, ${message.data.authorName} has reviewed you`,
				paragraphs: [
					`${message.data.authorName} wrote a review of the ${message.data.title}.`,
					`You will see it when you have written yours, or on ${message.data.visibleOn}, whichever comes first. Until then neither review shows, so both are written without seeing the other.`
				],
				action: { label: 'Write your review', url: message.data.url }
			});
		case 'reviews-visible':
			return render(`Both reviews of the ${message.data.title} now show`, {
				heading: `Hi ${message.data.displayName}, both reviews now show`,
				paragraphs: [
					`You and the other side have both reviewed the ${message.data.title}, so both reviews now show to each other and on the installer's public profile.`
				],
				action: { label: 'See the reviews', url: message.data.url }
			});
	}
}

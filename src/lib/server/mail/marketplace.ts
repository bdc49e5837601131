/**
 * E-mails of the marketplace: new-job digests for installers, quote batches for owners, Q&A
 * notes, polite declines and provisional bookings. Each renders a subject, an HTML part and a
 * plain-text part from the same words, in the house layout of mail-layout.ts.
 */

import { renderBlock as render, type RenderedEmail } from './layout';

export type MarketplaceEmail =
	| {
			template: 'quotes-received';
			data: {
				displayName: string;
				title: string;
				/** `gst`: 'incl. $36.36 GST' or the no-GST note; older queued e-mails lack it. */
				quotes: Array<{ businessName: string; total: string; revised: boolean; gst?: string }>;
				url: string;
			};
	  }
	| { template: 'job-message'; data: { heading: string; body: string; url: string } }
	| { template: 'quote-declined'; data: { businessName: string; title: string; url: string } }
	| {
			template: 'booking-provisional';
			data: { businessName: string; title: string; slot: string; holdUntil: string; url: string };
	  }
	| { template: 'booking-lapsed'; data: { businessName: string; title: string; slot: string } }
	| {
			template: 'booking-started';
			data: {
				displayName: string;
				businessName: string;
				title: string;
				slot: string;
				holdUntil: string;
				url: string;
			};
	  }
	| {
			template: 'booking-lapsed-owner';
			data: { displayName: string; businessName: string; title: string; slot: string; url: string };
	  }
	| {
			template: 'job-adjusted';
			data: {
				businessName: string;
				title: string;
				/** The new dates, or null when only the note changed. */
				dates: string[] | null;
				noteChanged: boolean;
				url: string;
			};
	  }
	| {
			template: 'new-jobs-digest';
			data: {
				displayName: string;
				jobs: Array<{ title: string; suburb: string; distance: string }>;
				url: string;
			};
	  };

/** Renders one of the marketplace's e-mails. */
export function renderMarketplaceEmail(message: MarketplaceEmail): RenderedEmail {
	switch (message.template) {
		case 'quotes-received': {
			const { quotes } = message.data;
			const n = quotes.length;
			return render(
				n === 1
					? `A quote for your ${message.data.title}`
					: `${String(n)} quotes for your ${message.data.title}`,
				{
					heading: `Hi ${message.data.displayName}, installers have priced your job`,
					paragraphs: [
						n === 1
							? 'One vetted installer sent or updated a quote:'
							: `${String(n)} vetted installers sent or updated quotes:`
					],
					list: quotes.map(
						(q) =>
							`${q.businessName}: ${q.total} ${q.gst ?? 'incl. GST'}${q.revised ? ' (revised)' : ''}`
					),
					action: { label: 'Compare the quotes', url: message.data.url },
					footnote: 'We gather quotes that arrive close together into one e-mail.'
				}
			);
		}
		case 'job-message':
			return render(message.data.heading, {
				heading: message.data.heading,
				paragraphs: [message.data.body],
				action: { label: 'Read and reply', url: message.data.url },
				footnote:
					'Phone numbers, e-mail addresses and links are hidden until the job is booked, so every arrangement stays on Tapline.'
			});
		case 'quote-declined':
			return render(`The ${message.data.title} went to another installer`, {
				heading: `Thanks for quoting, ${message.data.businessName}`,
				paragraphs: [
					`The owner of the ${message.data.title} booked another installer this time. Your quote was clear and complete, and it helped them choose.`,
					'New jobs in your area appear on your job board as soon as they are posted.'
				],
				action: { label: 'Open my job board', url: message.data.url }
			});
		case 'booking-provisional':
			return render(`Provisional booking: ${message.data.title}`, {
				heading: `${message.data.businessName}, the owner chose your quote`,
				paragraphs: [
					`The owner picked ${message.data.slot} for the ${message.data.title}.`,
					`The booking is provisional until the owner pays into held funds; the slot is held for them until ${message.data.holdUntil}. We tell you when it is confirmed or if the hold runs out.`
				],
				action: { label: 'See the job', url: message.data.url }
			});
		case 'booking-lapsed':
			return render(`The hold on ${message.data.slot} ran out`, {
				heading: `${message.data.businessName}, your slot is free again`,
				paragraphs: [
					`The owner of the ${message.data.title} did not pay in time, so the provisional booking for ${message.data.slot} lapsed and the time is back in your diary.`
				]
			});
		case 'booking-started':
			return render(
				`Your booking with ${message.data.businessName} is held until ${message.data.holdUntil}`,
				{
					heading: `Hi ${message.data.displayName}, your slot is held`,
					paragraphs: [
						`You chose ${message.data.businessName} for your ${message.data.title}, at ${message.data.slot}.`,
						`The booking is provisional until you pay into held funds. The installer keeps the time for you until ${message.data.holdUntil}; after that the hold lapses and the job takes quotes again. Nothing has been charged yet.`
					],
					action: { label: 'See your booking', url: message.data.url }
				}
			);
		case 'booking-lapsed-owner':
			return render(`Your hold with ${message.data.businessName} ran out`, {
				heading: `Hi ${message.data.displayName}, the hold on your booking lapsed`,
				paragraphs: [
					`The provisional booking with ${message.data.businessName} for ${message.data.slot} was not paid in time, so the installer's time is free again. Nothing was charged.`,
					`Your ${message.data.title} takes quotes again: you can book the same quote again while it is open, or choose another.`
				],
				action: { label: 'See your quotes', url: message.data.url }
			});
		case 'job-adjusted': {
			const { dates, noteChanged } = message.data;
			const what = dates && noteChanged ? 'dates and note' : dates ? 'dates' : 'note';
			return render(`The owner changed the ${what} of the ${message.data.title}`, {
				heading: `${message.data.businessName}, a job you quoted on changed`,
				paragraphs: [
					dates
						? 'The owner now prefers these dates:'
						: 'The owner changed their note to installers; read it on the job page.',
					...(dates && noteChanged ? ['They also changed their note to installers.'] : [])
				],
				...(dates ? { list: dates } : {}),
				action: { label: 'See the job and your quote', url: message.data.url },
				footnote:
					'Your quote stands as sent. If your times no longer suit, send a revised quote from the job page.'
			});
		}
		case 'new-jobs-digest': {
			const n = message.data.jobs.length;
			return render(n === 1 ? 'A new job in your area' : `${String(n)} new jobs in your area`, {
				heading: `Hi ${message.data.displayName}, new work near you`,
				paragraphs: ['Posted since our last e-mail, in your service area and within your skills:'],
				list: message.data.jobs.map((j) => `${j.title}, ${j.suburb} (about ${j.distance})`),
				action: { label: 'Open my job board', url: message.data.url },
				footnote: 'One e-mail a day at most; your job board always shows everything open.'
			});
		}
	}
}

const MARKETPLACE_TEMPLATES: ReadonlySet<string> = new Set<MarketplaceEmail['template']>([
	'quotes-received',
	'job-message',
	'quote-declined',
	'booking-provisional',
	'booking-lapsed',
	'booking-started',
	'booking-lapsed-owner',
	'job-adjusted',
	'new-jobs-digest'
]);

/** Whether a message is one of the marketplace's, so renderEmail can hand it over. */
export function isMarketplaceEmail(message: { template: string }): message is MarketplaceEmail {
	return MARKETPLACE_TEMPLATES.has(message.template);
}

/**
 * E-mails of the marketplace: new-job digests for installers, quote batches for owners, Q&A
 * notes, polite declines and provisional bookings. Each renders a subject, an HTML part and a
 * plain-text part from the same words, in the house look of mail-templates.ts.
 */

export interface MarketplaceRenderedEmail {
	subject: string;
	html: string;
	text: string;
}

export type MarketplaceEmail =
	| {
			template: 'quotes-received';
			data: {
				displayName: string;
				title: string;
				quotes: Array<{ businessName: string; total: string; revised: boolean }>;
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
			template: 'new-jobs-digest';
			data: {
				displayName: string;
				jobs: Array<{ title: string; suburb: string; distance: string }>;
				url: string;
			};
	  };

interface Block {
	heading: string;
	paragraphs: string[];
	list?: string[];
	action?: { label: string; url: string };
	footnote?: string;
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
const FOOTER = 'Tapline connects car owners with vetted installers for hard-wired dash cameras.';

function render(subject: string, block: Block): MarketplaceRenderedEmail {
	const paras = block.paragraphs
		.map((p) => `<p style="margin:0 0 14px;line-height:1.55">${escapeHtml(p)}</p>`)
		.join('');
	const list = block.list
		? `<ul style="margin:0 0 14px;padding-left:20px;line-height:1.55">${block.list.map((i) => `<li>${escapeHtml(i)}</li>`).join('')}</ul>`
		: '';
	const action = block.action
		? `<p style="margin:22px 0"><a href="${escapeHtml(block.action.url)}" style="background:#172030;color:#ffffff;padding:12px 20px;border-radius:6px;text-decoration:none;font-weight:700">${escapeHtml(block.action.label)}</a></p>` +
			`<p style="margin:0 0 14px;font-size:13px;color:#56677c">Or paste this address into your browser: ${escapeHtml(block.action.url)}</p>`
		: '';
	const foot = block.footnote
		? `<p style="margin:18px 0 0;font-size:13px;color:#56677c">${escapeHtml(block.footnote)}</p>`
		: '';
	const html = `<!doctype html><html lang="en-AU"><body style="margin:0;background:#f4f6f8;font-family:Nunito,Arial,sans-serif;color:#172030">
<div style="max-width:560px;margin:0 auto;padding:24px">
<p style="font-weight:900;font-size:20px;margin:0 0 16px;color:#172030">Tap<span style="color:#c96106">line</span></p>
<div style="background:#ffffff;border:1px solid #cbd3dc;border-radius:12px;padding:24px">
<h1 style="font-size:20px;margin:0 0 14px">${escapeHtml(block.heading)}</h1>${paras}${list}${action}${foot}
</div>
<p style="font-size:12px;color:#74859a;margin:16px 0 0">${FOOTER}</p>
</div></body></html>`;
	const text = [
		block.heading,
		'',
		...block.paragraphs.flatMap((p) => [p, '']),
		...(block.list ? [...block.list.map((i) => `- ${i}`), ''] : []),
		...(block.action ? [`${block.action.label}: ${block.action.url}`, ''] : []),
		...(block.footnote ? [block.footnote, ''] : []),
		'--',
		FOOTER
	].join('\n');
	return { subject, html, text };
}

/** Renders one of the marketplace's e-mails. */
export function renderMarketplaceEmail(message: MarketplaceEmail): MarketplaceRenderedEmail {
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
						(q) => `${q.businessName}: ${q.total} incl. GST${q.revised ? ' (revised)' : ''}`
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
	'new-jobs-digest'
]);

/** Whether a message is one of the marketplace's, so renderEmail can hand it over. */
export function isMarketplaceEmail(message: { template: string }): message is MarketplaceEmail {
	return MARKETPLACE_TEMPLATES.has(message.template);
}

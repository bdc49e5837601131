/**
 * The one look of Tapline's e-mails: a heading, paragraphs, an optional list, an optional button
 * and a footnote, rendered as an HTML part and a plain-text part from the same words.
 */

export interface RenderedEmail {
	subject: string;
	html: string;
	text: string;
}

export interface Block {
	heading: string;
	paragraphs: string[];
	list?: string[];
	action?: { label: string; url: string };
	footnote?: string;
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
const FOOTER = 'Tapline connects car owners with vetted installers for hard-wired dash cameras.';

/** Renders one e-mail in the house layout. */
export function renderBlock(subject: string, block: Block): RenderedEmail {
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

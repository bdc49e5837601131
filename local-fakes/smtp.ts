import { randomUUID } from 'node:crypto';
import { mkdir, readdir, readFile, rm, writeFile } from 'node:fs/promises';
import type { IncomingMessage, ServerResponse } from 'node:http';
import type { AddressInfo } from 'node:net';
import { join } from 'node:path';
import { simpleParser, type AddressObject, type ParsedMail } from 'mailparser';
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from 'smtp-server';
import { z } from 'zod';
import { escapeHtml, listenHttp, readJson, sendJson, urlHost } from './http-util';

/** Largest message accepted, advertised with the SIZE extension (RFC 1870). */
const MAX_MESSAGE_BYTES = 25 * 1024 * 1024;

/** Oldest messages are dropped past this many so a long dev session stays small. */
const MAX_MESSAGES = 1000;

/** A received message as the JSON API lists it. */
export interface MailSummary {
	id: string;
	messageId: string | null;
	/** Address in the From header, falling back to the envelope sender. */
	from: string;
	/** Envelope recipients (RCPT TO), so Bcc recipients are included. */
	to: string[];
	cc: string[];
	subject: string;
	text: string | null;
	html: string | null;
	/** Date header as an ISO UTC instant, or the receive time when the header is missing. */
	date: string;
	receivedAt: string;
}

/** A received message with its attachments listed. */
export interface MailDetail extends MailSummary {
	headerTo: string[];
	attachments: { filename: string | null; contentType: string; size: number }[];
}

interface StoredMail {
	detail: MailDetail;
	raw: Buffer;
}

interface Envelope {
	mailFrom: string;
	rcptTo: string[];
}

function addresses(field: AddressObject | AddressObject[] | undefined): string[] {
	const list = field === undefined ? [] : Array.isArray(field) ? field : [field];
	const out: string[] = [];
	for (const obj of list) {
		for (const entry of obj.value) {
			if (entry.address) out.push(entry.address);
			for (const member of entry.group ?? []) {
				if (member.address) out.push(member.address);
			}
		}
	}
	return out;
}

function toDetail(
	id: string,
	parsed: ParsedMail,
	envelope: Envelope,
	receivedAt: Date
): MailDetail {
	return {
		id,
		messageId: parsed.messageId ?? null,
		from: addresses(parsed.from)[0] ?? envelope.mailFrom,
		to: envelope.rcptTo,
		cc: addresses(parsed.cc),
		headerTo: addresses(parsed.to),
		subject: parsed.subject ?? '',
		text: parsed.text ?? null,
		html: typeof parsed.html === 'string' ? parsed.html : null,
		date: (parsed.date ?? receivedAt).toISOString(),
		receivedAt: receivedAt.toISOString(),
		attachments: parsed.attachments.map((a) => ({
			filename: a.filename ?? null,
			contentType: a.contentType,
			size: a.size
		}))
	};
}

function summary(detail: MailDetail): MailSummary {
	return {
		id: detail.id,
		messageId: detail.messageId,
		from: detail.from,
		to: detail.to,
		cc: detail.cc,
		subject: detail.subject,
		text: detail.text,
		html: detail.html,
		date: detail.date,
		receivedAt: detail.receivedAt
	};
}

const failNextSchema = z.object({
	count: z.number().int().min(0).max(10_000),
	// 4xx is a temporary failure the sender should retry; 5xx permanent (RFC 5321 §4.2.1).
	code: z.number().int().min(400).max(599).default(451),
	message: z.string().max(200).optional()
});

const persistedEnvelopeSchema = z.object({
	id: z.string(),
	receivedAt: z.string(),
	envelope: z.object({ mailFrom: z.string(), rcptTo: z.array(z.string()) })
});

/** Options for {@link startMailFake}. */
export interface MailFakeOptions {
	host: string;
	smtpPort: number;
	httpPort: number;
	/** When set, messages are also written to `<dataDir>/mail` and reloaded on start. */
	dataDir?: string;
}

/** A running mail fake: the SMTP listener and its HTTP API/inbox. */
export interface MailFake {
	smtpUrl: string;
	smtpPort: number;
	httpUrl: string;
	httpPort: number;
	close(): Promise<void>;
}

/**
 * Starts the SMTP server (no TLS, optional AUTH PLAIN/LOGIN accepting any credentials) and the
 * HTTP side: JSON API under `/api`, an HTML inbox at `/`.
 */
export async function startMailFake(options: MailFakeOptions): Promise<MailFake> {
	const messages: StoredMail[] = [];
	let failure = { count: 0, code: 451, message: 'Temporary local problem, try again later' };
	const mailDir = options.dataDir ? join(options.dataDir, 'mail') : null;

	if (mailDir) {
		await mkdir(mailDir, { recursive: true });
		const files = (await readdir(mailDir)).filter((f) => f.endsWith('.json'));
		for (const file of files) {
			const meta = persistedEnvelopeSchema.safeParse(
				JSON.parse(await readFile(join(mailDir, file), 'utf8'))
			);
			if (!meta.success) continue;
			const raw = await readFile(join(mailDir, `${meta.data.id}.eml`)).catch(() => null);
			if (!raw) continue;
			const parsed = await simpleParser(raw);
			messages.push({
				raw,
				detail: toDetail(meta.data.id, parsed, meta.data.envelope, new Date(meta.data.receivedAt))
			});
		}
		messages.sort((a, b) => a.detail.receivedAt.localeCompare(b.detail.receivedAt));
	}

	async function store(raw: Buffer, session: SMTPServerSession): Promise<string> {
		const id = randomUUID();
		const envelope: Envelope = {
			mailFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
			rcptTo: session.envelope.rcptTo.map((r) => r.address)
		};
		const receivedAt = new Date();
		const parsed = await simpleParser(raw);
		messages.push({ raw, detail: toDetail(id, parsed, envelope, receivedAt) });
		if (messages.length > MAX_MESSAGES) await forget(messages.splice(0, 1));
		if (mailDir) {
			await writeFile(join(mailDir, `${id}.eml`), raw);
			await writeFile(
				join(mailDir, `${id}.json`),
				JSON.stringify({ id, receivedAt: receivedAt.toISOString(), envelope })
			);
		}
		return id;
	}

	/** Drops the kept files of messages removed from the inbox, so a restart does not bring them back. */
	async function forget(removed: StoredMail[]): Promise<void> {
		if (!mailDir) return;
		for (const { detail } of removed) {
			await rm(join(mailDir, `${detail.id}.json`), { force: true });
			await rm(join(mailDir, `${detail.id}.eml`), { force: true });
		}
	}

	function onData(
		stream: SMTPServerDataStream,
		session: SMTPServerSession,
		callback: (err?: Error | null, message?: string) => void
	): void {
		const chunks: Buffer[] = [];
		stream.on('data', (chunk: Buffer) => chunks.push(chunk));
		stream.on('end', () => {
			if (stream.sizeExceeded) {
				callback(
					Object.assign(new Error('Message exceeds fixed maximum message size'), {
						responseCode: 552
					})
				);
				return;
			}
			// The body must be read to the end before answering, or the session desynchronises.
			if (failure.count > 0) {
				failure.count--;
				callback(Object.assign(new Error(failure.message), { responseCode: failure.code }));
				return;
			}
			store(Buffer.concat(chunks), session).then(
				(id) => callback(null, `Queued as ${id}`),
				(err: unknown) =>
					callback(
						Object.assign(new Error(err instanceof Error ? err.message : 'storage failed'), {
							responseCode: 451
						})
					)
			);
		});
	}

	const smtp = new SMTPServer({
		secure: false,
		disabledCommands: ['STARTTLS'],
		authOptional: true,
		// Auth over plain TCP is refused by default; this fake never carries real secrets.
		allowInsecureAuth: true,
		authMethods: ['PLAIN', 'LOGIN'],
		banner: 'Tapline local mail fake',
		size: MAX_MESSAGE_BYTES,
		logger: false,
		closeTimeout: 1000,
		onAuth(auth, _session, callback) {
			callback(null, { user: auth.username ?? 'anonymous' });
		},
		onData
	});
	smtp.on('error', () => {
		// Per-connection errors (client hang-ups) are reported here; the server keeps running.
	});
	await new Promise<void>((resolve, reject) => {
		smtp.server.once('error', reject);
		smtp.listen(options.smtpPort, options.host, () => {
			smtp.server.off('error', reject);
			resolve();
		});
	});
	const smtpPort = (smtp.server.address() as AddressInfo).port;

	function find(id: string): StoredMail | undefined {
		return messages.find((m) => m.detail.id === id);
	}

	async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
		const url = new URL(req.url ?? '/', 'http://fake.invalid');
		const path = url.pathname;
		const method = req.method ?? 'GET';

		if (path === '/api/messages') {
			if (method === 'DELETE') {
				await forget(messages.splice(0));
				sendJson(res, 200, { cleared: true });
				return;
			}
			if (method !== 'GET') {
				sendJson(res, 405, { error: 'use GET or DELETE' });
				return;
			}
			const to = url.searchParams.get('to')?.trim().toLowerCase();
			const list = messages
				.filter(
					(m) =>
						!to ||
						[...m.detail.to, ...m.detail.headerTo, ...m.detail.cc].some(
							(a) => a.toLowerCase() === to
						)
				)
				.reverse()
				.map((m) => summary(m.detail));
			sendJson(res, 200, list);
			return;
		}
		if (path === '/api/fail-next') {
			if (method !== 'POST') {
				sendJson(res, 405, { error: 'use POST' });
				return;
			}
			const parsed = failNextSchema.safeParse(await readJson(req).catch(() => null));
			if (!parsed.success) {
				sendJson(res, 400, { error: 'expected JSON {"count": N, "code"?: 400..599}' });
				return;
			}
			failure = {
				count: parsed.data.count,
				code: parsed.data.code,
				message: parsed.data.message ?? failure.message
			};
			sendJson(res, 200, { failNext: failure.count, code: failure.code });
			return;
		}
		const apiMatch = /^\/api\/messages\/([^/]+)(\/raw)?$/.exec(path);
		if (apiMatch && method === 'GET') {
			const found = find(apiMatch[1] ?? '');
			if (!found) {
				sendJson(res, 404, { error: 'no such message' });
				return;
			}
			if (apiMatch[2]) {
				res.writeHead(200, {
					'content-type': 'message/rfc822',
					'content-length': found.raw.length
				});
				res.end(found.raw);
				return;
			}
			sendJson(res, 200, found.detail);
			return;
		}
		if (path === '/clear' && method === 'POST') {
			await forget(messages.splice(0));
			res.writeHead(303, { location: '/' });
			res.end();
			return;
		}
		if (path === '/' && method === 'GET') {
			sendHtml(res, 200, inboxPage(messages.map((m) => m.detail).reverse(), smtpPort));
			return;
		}
		const pageMatch = /^\/messages\/([^/]+)$/.exec(path);
		if (pageMatch && method === 'GET') {
			const found = find(pageMatch[1] ?? '');
			if (!found) {
				sendHtml(
					res,
					404,
					layout('Not found', '<p>No such message. <a href="/">Back to inbox</a></p>')
				);
				return;
			}
			sendHtml(res, 200, messagePage(found.detail));
			return;
		}
		sendJson(res, 404, { error: 'not found' });
	}

	const http = await listenHttp(handle, options.host, options.httpPort);
	return {
		smtpUrl: `smtp://${urlHost(options.host)}:${smtpPort}`,
		smtpPort,
		httpUrl: http.url,
		httpPort: http.port,
		close: async () => {
			await Promise.all([
				http.close(),
				new Promise<void>((resolve) => smtp.close(() => resolve()))
			]);
		}
	};
}

function sendHtml(res: ServerResponse, status: number, html: string): void {
	res.writeHead(status, {
		'content-type': 'text/html; charset=utf-8',
		'cache-control': 'no-store',
		// The iframe srcdoc inherits this policy, so mail HTML cannot run scripts or fetch remote images.
		'content-security-policy':
			"default-src 'none'; style-src 'unsafe-inline'; img-src data:; form-action 'self'; base-uri 'none'; frame-ancestors 'none'"
	});
	res.end(html);
}

function layout(title: string, body: string): string {
	return `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escapeHtml(title)} · local mail</title>
<style>
	body { font: 15px/1.45 system-ui, sans-serif; margin: 0; background: #f4f1ea; color: #222; }
	header { background: #20343a; color: #f4f1ea; padding: 0.6rem 1.2rem; display: flex; gap: 1rem; align-items: baseline; }
	header a { color: inherit; text-decoration: none; font-weight: 600; }
	header small { opacity: 0.75; }
	main { max-width: 60rem; margin: 1.2rem auto; padding: 0 1rem; }
	table { width: 100%; border-collapse: collapse; background: #fff; }
	th, td { text-align: left; padding: 0.45rem 0.6rem; border-bottom: 1px solid #e2ddd2; vertical-align: top; }
	th { font-size: 0.8rem; text-transform: uppercase; letter-spacing: 0.04em; color: #5b6b6f; }
	td.time { white-space: nowrap; font-variant-numeric: tabular-nums; color: #5b6b6f; }
	a { color: #1f5f73; }
	.empty { padding: 2rem; text-align: center; background: #fff; color: #5b6b6f; }
	iframe { width: 100%; min-height: 28rem; border: 1px solid #d5cfc2; background: #fff; }
	pre { white-space: pre-wrap; background: #fff; border: 1px solid #d5cfc2; padding: 0.8rem; }
	h2 { font-size: 1rem; margin: 1.4rem 0 0.4rem; }
	.bar { display: flex; gap: 1rem; align-items: center; margin-bottom: 0.8rem; }
	button { font: inherit; background: none; border: 1px solid currentColor; color: inherit; padding: 0.1rem 0.6rem; cursor: pointer; }
</style>
</head>
<body>
<header><a href="/">Local mail</a><small>Tapline stand-in for the outgoing mail service</small></header>
<main>
${body}
</main>
</body>
</html>`;
}

function inboxPage(list: MailDetail[], smtpPort: number): string {
	const rows = list
		.map(
			(m) => `<tr>
	<td><a href="/messages/${encodeURIComponent(m.id)}">${escapeHtml(m.subject || '(no subject)')}</a></td>
	<td>${escapeHtml(m.to.join(', '))}</td>
	<td class="time">${escapeHtml(m.receivedAt.replace('T', ' ').slice(0, 19))} UTC</td>
</tr>`
		)
		.join('\n');
	const table =
		list.length === 0
			? `<p class="empty">No mail yet. Point SMTP at port ${smtpPort} and send something.</p>`
			: `<table><thead><tr><th>Subject</th><th>To</th><th>Received</th></tr></thead><tbody>
${rows}
</tbody></table>`;
	return layout(
		'Inbox',
		`<div class="bar">${list.length} message${list.length === 1 ? '' : 's'}
<form method="post" action="/clear"><button>Clear all</button></form></div>
${table}`
	);
}

function messagePage(m: MailDetail): string {
	const head = [
		['From', m.from],
		['To', m.to.join(', ')],
		['Cc', m.cc.join(', ')],
		['Subject', m.subject],
		['Date', m.date],
		['Message-ID', m.messageId ?? '']
	]
		.filter(([, value]) => value)
		.map(
			([name, value]) =>
				`<tr><th>${escapeHtml(name ?? '')}</th><td>${escapeHtml(value ?? '')}</td></tr>`
		)
		.join('\n');
	// An empty sandbox attribute gives the frame an opaque origin with scripts, forms and popups off.
	const htmlPart = m.html
		? `<h2>HTML part</h2><iframe sandbox="" title="HTML part" srcdoc="${escapeHtml(m.html)}"></iframe>`
		: '<h2>HTML part</h2><p>None.</p>';
	const textPart = `<h2>Text part</h2>${m.text ? `<pre>${escapeHtml(m.text)}</pre>` : '<p>None.</p>'}`;
	const attachments = m.attachments.length
		? `<h2>Attachments</h2><ul>${m.attachments
				.map(
					(a) =>
						`<li>${escapeHtml(a.filename ?? '(unnamed)')} — ${escapeHtml(a.contentType)}, ${a.size} bytes</li>`
				)
				.join('')}</ul>`
		: '';
	return layout(
		m.subject || '(no subject)',
		`<p><a href="/">← Inbox</a> · <a href="/api/messages/${encodeURIComponent(m.id)}/raw">raw source</a></p>
<table>${head}</table>
${htmlPart}
${textPart}
${attachments}`
	);
}

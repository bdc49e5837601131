import { mkdtemp, readdir, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createTransport } from 'nodemailer';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { startFakes, type RunningFakes } from './index';
import type { MailDetail, MailSummary } from './smtp';

const EPHEMERAL = {
	smtpPort: 0,
	mailHttpPort: 0,
	s3Port: 0,
	geocodePort: 0,
	tilesPort: 0,
	stripePort: 0
};

let fakes: RunningFakes;

function transport(withAuth = false) {
	return createTransport({
		host: '127.0.0.1',
		port: fakes.ports.smtp,
		secure: false,
		ignoreTLS: true,
		...(withAuth ? { auth: { user: 'app', pass: 'anything' } } : {})
	});
}

async function listMail(query = ''): Promise<MailSummary[]> {
	const res = await fetch(`${fakes.urls.mailApi}/api/messages${query}`);
	expect(res.status).toBe(200);
	return (await res.json()) as MailSummary[];
}

async function failNext(body: unknown): Promise<Response> {
	return fetch(`${fakes.urls.mailApi}/api/fail-next`, {
		method: 'POST',
		headers: { 'content-type': 'application/json' },
		body: JSON.stringify(body)
	});
}

beforeAll(async () => {
	fakes = await startFakes(EPHEMERAL);
});

afterAll(async () => {
	await fakes.close();
});

beforeEach(async () => {
	const res = await fetch(`${fakes.urls.mailApi}/api/messages`, { method: 'DELETE' });
	expect(res.status).toBe(200);
});

describe('mail fake over SMTP', () => {
	it('binds real ports when asked for port 0', () => {
		expect(fakes.ports.smtp).toBeGreaterThan(0);
		expect(fakes.urls.smtp).toBe(`smtp://127.0.0.1:${fakes.ports.smtp}`);
		expect(fakes.urls.mailApi).toBe(`http://127.0.0.1:${fakes.ports.mailHttp}`);
	});

	it('stores a sent message with its parts and envelope recipients, Bcc included', async () => {
		const info = await transport(true).sendMail({
			from: 'Tapline <no-reply@tapline.test>',
			to: 'owner@example.test',
			cc: 'installer@example.test',
			bcc: 'audit@example.test',
			subject: 'Your quote is ready',
			text: 'A quote of $189.00 incl. GST is waiting.',
			html: '<p>A quote of <strong>$189.00</strong> incl. GST is waiting.</p>'
		});
		expect(info.accepted).toHaveLength(3);

		const forOwner = await listMail('?to=OWNER@example.test');
		expect(forOwner).toHaveLength(1);
		const [message] = forOwner;
		expect(message?.subject).toBe('Your quote is ready');
		expect(message?.from).toBe('no-reply@tapline.test');
		expect(message?.to.sort()).toEqual(
			['audit@example.test', 'installer@example.test', 'owner@example.test'].sort()
		);
		expect(message?.text?.trim()).toBe('A quote of $189.00 incl. GST is waiting.');
		expect(message?.html).toContain('<strong>$189.00</strong>');
		expect(message?.messageId).toBe(info.messageId);
		expect(Number.isNaN(Date.parse(message?.date ?? ''))).toBe(false);

		expect(await listMail('?to=audit@example.test')).toHaveLength(1);
		expect(await listMail('?to=nobody@example.test')).toHaveLength(0);

		const detail = await fetch(`${fakes.urls.mailApi}/api/messages/${message?.id ?? ''}`);
		expect(detail.status).toBe(200);
		const body = (await detail.json()) as MailDetail;
		expect(body.headerTo).toEqual(['owner@example.test']);
		expect(body.cc).toEqual(['installer@example.test']);

		const raw = await fetch(`${fakes.urls.mailApi}/api/messages/${message?.id ?? ''}/raw`);
		expect(raw.headers.get('content-type')).toBe('message/rfc822');
		expect(await raw.text()).toContain('Subject: Your quote is ready');
	});

	it('lists newest first and answers 404 for an unknown id', async () => {
		const mailer = transport();
		await mailer.sendMail({
			from: 'a@tapline.test',
			to: 'x@example.test',
			subject: 'first',
			text: '1'
		});
		await mailer.sendMail({
			from: 'a@tapline.test',
			to: 'x@example.test',
			subject: 'second',
			text: '2'
		});
		const list = await listMail();
		expect(list.map((m) => m.subject)).toEqual(['second', 'first']);

		const missing = await fetch(`${fakes.urls.mailApi}/api/messages/no-such-id`);
		expect(missing.status).toBe(404);
	});

	it('rejects the next N messages at DATA with a temporary 451, then accepts again', async () => {
		const armed = await failNext({ count: 2 });
		expect(armed.status).toBe(200);
		const mailer = transport();
		const message = {
			from: 'a@tapline.test',
			to: 'x@example.test',
			subject: 'retry me',
			text: 'x'
		};

		for (let i = 0; i < 2; i++) {
			const err: unknown = await mailer.sendMail(message).then(
				() => null,
				(e: unknown) => e
			);
			expect(err).toBeInstanceOf(Error);
			expect((err as { responseCode?: number }).responseCode).toBe(451);
		}
		expect(await listMail()).toHaveLength(0);

		const info = await mailer.sendMail(message);
		expect(info.response).toMatch(/^250 /);
		expect(await listMail()).toHaveLength(1);
	});

	it('can fail with a chosen code and validates the control body', async () => {
		expect((await failNext({ count: 1, code: 550 })).status).toBe(200);
		await expect(
			transport().sendMail({
				from: 'a@tapline.test',
				to: 'x@example.test',
				subject: 's',
				text: 't'
			})
		).rejects.toMatchObject({ responseCode: 550 });

		expect((await failNext({ count: -1 })).status).toBe(400);
		expect((await failNext({ count: 1, code: 250 })).status).toBe(400);
	});

	it('renders the inbox and message pages with escaped text and a sandboxed HTML part', async () => {
		await transport().sendMail({
			from: 'a@tapline.test',
			to: 'x@example.test',
			subject: 'Fuse <script>alert(1)</script> tap',
			text: 'Text part & more',
			html: '<p onclick="x()">Hello "owner"</p>'
		});
		const inbox = await fetch(`${fakes.urls.mailApi}/`);
		expect(inbox.headers.get('content-type')).toContain('text/html');
		const inboxHtml = await inbox.text();
		expect(inboxHtml).toContain('Fuse &lt;script&gt;alert(1)&lt;/script&gt; tap');
		expect(inboxHtml).not.toContain('<script>');

		const [message] = await listMail();
		const page = await (await fetch(`${fakes.urls.mailApi}/messages/${message?.id ?? ''}`)).text();
		expect(page).toMatch(/<iframe sandbox="" [^>]*srcdoc="&lt;p onclick=&quot;x\(\)&quot;&gt;/);
		expect(page).toContain('Text part &amp; more');
	});
});

describe('mail fake persistence', () => {
	it('writes .eml files to the data folder, reloads them on restart and forgets them when cleared', async () => {
		const dataDir = await mkdtemp(join(tmpdir(), 'tapline-fakes-'));
		try {
			const first = await startFakes({ ...EPHEMERAL, dataDir });
			await createTransport({
				host: '127.0.0.1',
				port: first.ports.smtp,
				ignoreTLS: true
			}).sendMail({
				from: 'a@tapline.test',
				to: 'kept@example.test',
				subject: 'kept across restarts',
				text: 'still here'
			});
			await first.close();
			expect((await readdir(join(dataDir, 'mail'))).filter((f) => f.endsWith('.eml'))).toHaveLength(
				1
			);

			const second = await startFakes({ ...EPHEMERAL, dataDir });
			try {
				const res = await fetch(`${second.urls.mailApi}/api/messages?to=kept@example.test`);
				const list = (await res.json()) as MailSummary[];
				expect(list.map((m) => m.subject)).toEqual(['kept across restarts']);
				expect(list[0]?.to).toEqual(['kept@example.test']);
				// Clearing the inbox clears the kept files too: nothing comes back next time.
				await fetch(`${second.urls.mailApi}/api/messages`, { method: 'DELETE' });
			} finally {
				await second.close();
			}
			expect(await readdir(join(dataDir, 'mail'))).toEqual([]);
			const third = await startFakes({ ...EPHEMERAL, dataDir });
			try {
				const res = await fetch(`${third.urls.mailApi}/api/messages`);
				expect(await res.json()).toEqual([]);
			} finally {
				await third.close();
			}
		} finally {
			await rm(dataDir, { recursive: true, force: true });
		}
	});
});

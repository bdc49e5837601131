import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { startMailFake, type MailFake } from '../../local-fakes/smtp';
import { db } from '$lib/server/db';
import { emailOutbox } from '$lib/server/db/schema';
import { appUrl } from '$lib/server/mail/app-url';
import {
	deliverEmail,
	listStrandedEmails,
	MAX_DELIVERY_ATTEMPTS,
	queueEmail,
	withMail
} from '$lib/server/mail/outbox';
import { makeAccount } from './vetting-helpers';

let fake: MailFake;

beforeAll(async () => {
	fake = await startMailFake({ host: '127.0.0.1', smtpPort: 0, httpPort: 0 });
	// The transport is created on first use, from these.
	process.env.SMTP_HOST = '127.0.0.1';
	process.env.SMTP_PORT = String(fake.smtpPort);
});
afterAll(() => fake.close());
beforeEach(async () => {
	await fetch(`${fake.httpUrl}/api/messages`, { method: 'DELETE' });
});

async function inbox(to: string) {
	const res = await fetch(`${fake.httpUrl}/api/messages?to=${encodeURIComponent(to)}`);
	return (await res.json()) as { subject: string; text: string; html: string; messageId: string }[];
}

const queue = (to: string) =>
	db.transaction((tx) =>
		queueEmail(tx, to, {
			template: 'reset-password',
			data: { displayName: 'Kit', url: 'http://tapline.test/reset-password?token=abc' }
		})
	);

describe('outbox delivery', () => {
	it('sends the HTML and plain-text parts and marks the row sent', async () => {
		const id = await queue('kit@example.test');
		expect(await deliverEmail(id)).toBe('sent');
		const [got] = await inbox('kit@example.test');
		expect(got?.subject).toBe('Reset your Tapline password');
		expect(got?.text).toContain(
			'Choose a new password: http://tapline.test/reset-password?token=abc'
		);
		expect(got?.html).toContain('href="http://tapline.test/reset-password?token=abc"');
		expect(got?.messageId).toBe(`<${id}@tapline.mail>`);
		const [row] = await db.select().from(emailOutbox).where(eq(emailOutbox.id, id));
		expect(row?.sentAt).toBeInstanceOf(Date);
		expect(row?.attempts).toBe(1);
	});

	it('keeps the message through an SMTP outage and sends it on the retry', async () => {
		const id = await queue('outage@example.test');
		await fetch(`${fake.httpUrl}/api/fail-next`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({ count: 1 })
		});
		const first = await deliverEmail(id);
		expect(typeof first === 'object' && first.error).toMatch(/451|try again/i);
		const [afterFailure] = await db.select().from(emailOutbox).where(eq(emailOutbox.id, id));
		expect(afterFailure?.sentAt).toBeNull();
		expect(afterFailure?.attempts).toBe(1);
		expect(await inbox('outage@example.test')).toHaveLength(0);

		expect(await deliverEmail(id)).toBe('sent');
		expect(await inbox('outage@example.test')).toHaveLength(1);
	});

	it('sends a message exactly once when two workers race for it', async () => {
		const id = await queue('race@example.test');
		const results = await Promise.all([deliverEmail(id), deliverEmail(id), deliverEmail(id)]);
		expect(results.filter((r) => r === 'sent')).toHaveLength(1);
		expect(await deliverEmail(id)).toBe('skipped');
		expect(await inbox('race@example.test')).toHaveLength(1);
	});

	it('lists unsent messages past the grace period for the sweeper, not sent ones', async () => {
		const stranded = await queue('stranded@example.test');
		const sent = await queue('sent@example.test');
		await deliverEmail(sent);
		await db.update(emailOutbox).set({ createdAt: new Date(Date.now() - 10 * 60_000) });
		const ids = await listStrandedEmails(5 * 60_000);
		expect(ids).toContain(stranded);
		expect(ids).not.toContain(sent);
	});
});

describe('permanent rejections (issue 11, item 16)', () => {
	const failNext = (code: number) =>
		fetch(`${fake.httpUrl}/api/fail-next`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({ count: 1, code })
		});

	it('gives up a 5xx at once, keeps it from the sweeper and tells every admin', async () => {
		const admin = await makeAccount('admin');
		const id = await queue('no-such-mailbox@example.test');
		await failNext(550);
		expect(await deliverEmail(id)).toBe('failed');
		const [row] = await db.select().from(emailOutbox).where(eq(emailOutbox.id, id));
		expect(row?.sentAt).toBeNull();
		expect(row?.attempts).toBe(MAX_DELIVERY_ATTEMPTS);
		expect(row?.lastError).toMatch(/^Permanent rejection: .*550/);
		await db
			.update(emailOutbox)
			.set({ createdAt: new Date(Date.now() - 10 * 60_000) })
			.where(eq(emailOutbox.id, id));
		expect(await listStrandedEmails(5 * 60_000)).not.toContain(id);

		const [notice] = await db
			.select()
			.from(emailOutbox)
			.where(
				and(eq(emailOutbox.toAddress, admin.email), eq(emailOutbox.template, 'email-undeliverable'))
			);
		expect(notice?.text).toContain('no-such-mailbox@example.test');
		expect(notice?.text).toContain('Reset your Tapline password');

		// The notice bouncing in its turn is given up without another notice.
		await failNext(550);
		expect(await deliverEmail(notice!.id)).toBe('failed');
		const notices = await db
			.select({ id: emailOutbox.id })
			.from(emailOutbox)
			.where(
				and(eq(emailOutbox.toAddress, admin.email), eq(emailOutbox.template, 'email-undeliverable'))
			);
		expect(notices).toHaveLength(1);
	});

	it('still retries a temporary 4xx', async () => {
		const id = await queue('busy@example.test');
		await failNext(421);
		expect(await deliverEmail(id)).toMatchObject({ error: expect.any(String) });
		const [row] = await db.select().from(emailOutbox).where(eq(emailOutbox.id, id));
		expect(row?.attempts).toBe(1);
		expect(await deliverEmail(id)).toBe('sent');
	});
});

describe('withMail', () => {
	const resetMail = () => ({
		template: 'reset-password' as const,
		data: { displayName: 'Kit', url: 'http://tapline.test/reset-password?token=abc' }
	});
	const rowsFor = (to: string) =>
		db.select().from(emailOutbox).where(eq(emailOutbox.toAddress, to));

	it('writes the message with the change and runs after-commit work once committed', async () => {
		const after: string[] = [];
		const result = await withMail(async (_tx, mail) => {
			await mail.send('committed@example.test', resetMail());
			mail.afterCommit(async () => {
				after.push('ran');
			});
			// Still inside the transaction: the after-commit task has not run yet.
			expect(after).toEqual([]);
			return 'done';
		});
		expect(result).toBe('done');
		expect(after).toEqual(['ran']);
		expect(await rowsFor('committed@example.test')).toHaveLength(1);
	});

	it('leaves no message and runs nothing when the change rolls back', async () => {
		const after: string[] = [];
		await expect(
			withMail(async (_tx, mail) => {
				await mail.send('rolled-back@example.test', resetMail());
				mail.afterCommit(async () => {
					after.push('ran');
				});
				throw new Error('the change failed');
			})
		).rejects.toThrow('the change failed');
		expect(after).toEqual([]);
		expect(await rowsFor('rolled-back@example.test')).toHaveLength(0);
	});
});

describe('appUrl', () => {
	it('builds links from the configured origin, not from whoever asked', () => {
		const before = process.env.ORIGIN;
		process.env.ORIGIN = 'https://tapline.example/';
		try {
			expect(appUrl('/installer/jobs')).toBe('https://tapline.example/installer/jobs');
			expect(appUrl('owner')).toBe('https://tapline.example/owner');
		} finally {
			process.env.ORIGIN = before;
		}
	});
});

// Fault drill (issue 17): the SMTP server down for a while. The mail fake is stopped (nothing
// listens on its port), changes keep queueing e-mail in the outbox, deliveries fail as temporary
// errors and are recorded; once a server listens on the port again, the sweeper's list and the
// per-message jobs (both, racing) deliver every message exactly once, counted by Message-ID.
import { inArray } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startMailFake, type MailFake } from '../../local-fakes/smtp';
import { db } from '$lib/server/db';
import { emailOutbox } from '$lib/server/db/schema';
import { deliverEmail, listStrandedEmails, queueEmail } from '$lib/server/mail/outbox';

let fake: MailFake | undefined;
let smtpPort = 0;

beforeAll(async () => {
	fake = await startMailFake({ host: '127.0.0.1', smtpPort: 0, httpPort: 0 });
	smtpPort = fake.smtpPort;
	// The transport is created on first use, from these.
	process.env.SMTP_HOST = '127.0.0.1';
	process.env.SMTP_PORT = String(smtpPort);
});
afterAll(() => fake?.close());

const queueOne = (to: string, n: number) =>
	db.transaction((tx) =>
		queueEmail(tx, to, {
			template: 'reset-password',
			data: {
				displayName: `Kit ${String(n)}`,
				url: `http://tapline.test/reset?token=t${String(n)}`
			}
		})
	);

async function received(server: MailFake) {
	const res = await fetch(`${server.httpUrl}/api/messages`);
	return (await res.json()) as { messageId: string; to: string[] }[];
}

async function outboxRows(ids: string[]) {
	return db.select().from(emailOutbox).where(inArray(emailOutbox.id, ids));
}

describe('the SMTP server down for a while', () => {
	it('keeps every message in the outbox and delivers each exactly once when it is back', async () => {
		// Delivered before the outage: the transport works, and this one must not come again.
		const before = await queueOne('before@example.test', 0);
		expect(await deliverEmail(before)).toBe('sent');
		await fake!.close();
		fake = undefined;

		const ids: string[] = [];
		for (let n = 1; n <= 6; n++) ids.push(await queueOne(`down-${String(n)}@example.test`, n));
		// Two rounds of attempts while nothing listens: each a temporary failure, recorded.
		for (let round = 1; round <= 2; round++) {
			const results = await Promise.all(ids.map((id) => deliverEmail(id)));
			for (const r of results)
				expect(r).toMatchObject({ error: expect.stringMatching(/ECONNREFUSED|connect/i) });
		}
		for (const row of await outboxRows(ids)) {
			expect(row.sentAt).toBeNull();
			expect(row.attempts).toBe(2);
			expect(row.lastError).toMatch(/ECONNREFUSED|connect/i);
		}
		// The sweeper would pick them all up (they are unsent and have not given up).
		expect(new Set(await listStrandedEmails(0))).toEqual(new Set(ids));

		// Back on the same port, empty.
		fake = await startMailFake({ host: '127.0.0.1', smtpPort, httpPort: 0 });
		expect(await received(fake)).toEqual([]);
		// The sweeper's re-queued deliveries and the retries of the first jobs run at once.
		const swept = await listStrandedEmails(0);
		const results = await Promise.all([
			...swept.map((id) => deliverEmail(id)),
			...ids.map((id) => deliverEmail(id)),
			deliverEmail(before)
		]);
		expect(results.filter((r) => r === 'sent')).toHaveLength(ids.length);
		expect(results.filter((r) => typeof r === 'object')).toEqual([]);

		const inbox = await received(fake);
		expect(inbox.map((m) => m.messageId).sort()).toEqual(
			ids.map((id) => `<${id}@tapline.mail>`).sort()
		);
		for (const row of await outboxRows(ids)) {
			expect(row.sentAt).toBeInstanceOf(Date);
			expect(row.attempts).toBe(3);
			expect(row.lastError).toBeNull();
		}
		expect(await listStrandedEmails(0)).toEqual([]);
		// Asked again (a late job), nothing more goes out.
		expect(await Promise.all(ids.map((id) => deliverEmail(id)))).toEqual(ids.map(() => 'skipped'));
		expect(await received(fake)).toHaveLength(ids.length);
	});
});

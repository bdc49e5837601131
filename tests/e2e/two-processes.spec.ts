/**
 * Beyond one machine: a second app process on another port, on the same database and fakes.
 * Sessions live in PostgreSQL, so a sign-in on one process carries on on the other and a sign-out
 * on either ends it on both; e-mail goes through the outbox and pg-boss, which both processes
 * work, and each message is delivered exactly once.
 */
import { DEMO, DEMO_PASSWORD, expect, test, uniqueEmail } from './fixtures';
import { startOwnApp, type OwnApp } from './support/own-app';
import { BASE_URL, closeQueries, query } from './support/requests';

const MAIL_API = process.env.FAKE_MAIL_API ?? 'http://127.0.0.1:3580';
let second: OwnApp | undefined;

test.afterAll(async () => {
	await second?.stop();
	await closeQueries();
});

const cookieOf = (res: Response) =>
	res.headers
		.getSetCookie()
		.map((c) => c.split(';')[0])
		.join('; ');

function post(base: string, path: string, fields: Record<string, string>, cookie = '') {
	return fetch(`${base}${path}`, {
		method: 'POST',
		body: new URLSearchParams(fields),
		headers: { origin: base, accept: 'text/html', ...(cookie ? { cookie } : {}) },
		redirect: 'manual'
	});
}
const get = (base: string, path: string, cookie: string) =>
	fetch(`${base}${path}`, { headers: { cookie, accept: 'text/html' }, redirect: 'manual' });

test('a session started on one process continues on the other, and a sign-out ends it on both', async () => {
	test.setTimeout(90_000);
	second ??= await startOwnApp(23, {});
	const signIn = await post(BASE_URL, '/sign-in', { email: DEMO.owner, password: DEMO_PASSWORD });
	expect(signIn.status).toBe(303);
	const cookie = cookieOf(signIn);
	const onSecond = await get(second.url, '/owner', cookie);
	expect(onSecond.status).toBe(200);
	expect(await onSecond.text()).toContain('My jobs');

	const signOut = await post(second.url, '/sign-out', {}, cookie);
	expect(signOut.status).toBe(303);
	for (const base of [BASE_URL, second.url]) {
		const res = await get(base, '/owner', cookie);
		expect(res.status, base).toBe(303);
		expect(res.headers.get('location'), base).toContain('/sign-in');
	}
});

test('e-mails queued on either process are each delivered exactly once', async () => {
	test.setTimeout(120_000);
	second ??= await startOwnApp(23, {});
	// Sign-ups on both processes: each queues one confirmation e-mail in its own transaction.
	const addresses = Array.from({ length: 6 }, (_, i) => uniqueEmail(`two-processes-${i}`));
	await Promise.all(
		addresses.map(async (email, i) => {
			const base = i % 2 === 0 ? BASE_URL : second!.url;
			const res = await post(base, '/sign-up', {
				role: 'owner',
				displayName: 'Two Processes',
				email,
				password: 'long enough passphrase'
			});
			expect(res.status, email).toBe(303);
		})
	);
	const inbox = async (email: string) =>
		(
			(await (
				await fetch(`${MAIL_API}/api/messages?to=${encodeURIComponent(email)}`)
			).json()) as unknown[]
		).length;
	for (const email of addresses) {
		await expect.poll(() => inbox(email), { timeout: 60_000 }).toBe(1);
	}
	// Every outbox row was sent, on its first attempt: no process sent another's message again.
	const rows = await query<{ attempts: number; sent: boolean }>(
		`SELECT attempts, sent_at IS NOT NULL AS sent FROM email_outbox WHERE to_address = ANY($1)`,
		[addresses]
	);
	expect(rows).toHaveLength(addresses.length);
	for (const row of rows) expect(row).toEqual({ attempts: 1, sent: true });
	// And still one each after the e-mail sweeper has had a chance to look again.
	for (const email of addresses) expect(await inbox(email)).toBe(1);
	expect(second.process.exitCode, second.output()).toBeNull();
});

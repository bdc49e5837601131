/**
 * Beyond one machine: a second app process on another port, on the same database and fakes.
 * Sessions live in PostgreSQL, so a sign-in on one process carries on on the other and a sign-out
 * on either ends it on both; e-mail goes through the outbox and pg-boss, which both processes
 * work, and each message is delivered exactly once. The schedules that move money run on both
 * processes too: work whose owner's window has closed is confirmed by the `booking-auto-confirm`
 * schedule and its held funds paid out once, with one transfer at the payments fake, one ledger
 * posting and one e-mail of each kind.
 */
import Stripe from 'stripe';
import { DEMO, DEMO_PASSWORD, expect, jpegPhoto, test, uniqueEmail } from './fixtures';
import { fileFitReport, paidBooking } from './support/fit-booking';
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

/** The payments fake through the SDK, as the app reaches it (`npm test` sets these). */
const payments = new Stripe(process.env.STRIPE_SECRET_KEY ?? 'sk_test_tapline_local', {
	host: process.env.STRIPE_API_HOST ?? '127.0.0.1',
	port: Number(process.env.STRIPE_API_PORT ?? 2600),
	protocol: 'http'
});

interface Overdue {
	bookingId: string;
	title: string;
	ownerEmail: string;
	installerEmail: string;
}

test('overdue work is confirmed and paid out once by the schedules of both processes', async ({
	browser
}) => {
	// Four paid bookings through the pages, the wait for the minute's schedule, and the checks.
	test.setTimeout(480_000);
	second ??= await startOwnApp(23, {});
	const photo = await jpegPhoto();
	const overdue: Overdue[] = [];
	for (let i = 0; i < 4; i++) {
		const { bookingId, title, ownerPage, phone } = await paidBooking(browser, `two-money-${i}`);
		await fileFitReport(phone, bookingId, photo, { rear: true });
		await ownerPage.context().close();
		await phone.context().close();
		const [people] = await query<{ owner_email: string; installer_email: string }>(
			`SELECT o.email AS owner_email, i.email AS installer_email FROM booking b
			JOIN "user" o ON o.id = b.owner_id JOIN "user" i ON i.id = b.installer_id WHERE b.id = $1`,
			[bookingId]
		);
		overdue.push({
			bookingId,
			title,
			ownerEmail: people!.owner_email,
			installerEmail: people!.installer_email
		});
	}
	const ids = overdue.map((o) => o.bookingId);
	// The fit reports opened the owners' windows; nothing is confirmed or asked to be paid yet.
	expect(
		await query(
			`SELECT b.stage, b.confirm_by > now() AS open, p.release_requested_at IS NULL AS unasked
			FROM booking b JOIN payment p ON p.booking_id = b.id WHERE b.id = ANY($1)`,
			[ids]
		)
	).toEqual(ids.map(() => ({ stage: 'reported', open: true, unasked: true })));

	// The owners' windows close without an answer. Waiting out the window (72 hours by default) is
	// not possible here, so the deadline is moved into the past in SQL, the one step the test
	// takes itself (the window's length is tested in tests/integration/completion.test.ts). From
	// here on everything is the app's: the `booking-auto-confirm` schedule fires every minute on
	// both processes' pg-boss (the job is sent once and fetched by one worker, SKIP LOCKED), each
	// booking is locked and its stage re-checked, and the release is paid after commit; the
	// `held-funds-release` schedule, also on both, retries any release left asked for.
	await query(`UPDATE booking SET confirm_by = now() - interval '1 minute' WHERE id = ANY($1)`, [
		ids
	]);
	const paidOut = async () =>
		Number(
			(
				await query<{ n: string }>(
					`SELECT count(*) AS n FROM payment WHERE booking_id = ANY($1) AND released_at IS NOT NULL`,
					[ids]
				)
			)[0]!.n
		);
	// The next minute of the schedule, found by pg-boss's cron check (every 30 s) and sent on by its
	// cron worker (every 5 s): well under two minutes.
	await expect.poll(paidOut, { timeout: 150_000, intervals: [2_000] }).toBe(ids.length);
	// And one more run of the schedule, started after the last payout, has finished: whichever
	// process ran it found nothing left to confirm or pay (the checks below would see a second
	// transfer or e-mail).
	const laterRuns = async () =>
		Number(
			(
				await query<{ n: string }>(
					`SELECT count(*) AS n FROM pgboss.job WHERE name = 'booking-auto-confirm'
					AND state = 'completed' AND started_on > (SELECT max(released_at) FROM payment
					WHERE booking_id = ANY($1))`,
					[ids]
				)
			)[0]!.n
		);
	await expect.poll(laterRuns, { timeout: 150_000, intervals: [2_000] }).toBeGreaterThan(0);

	// Each booking: accepted once, by the window, with its release asked for and carried out.
	const accepted = await query<{ stage: string; accepted_by: string; released: boolean }>(
		`SELECT b.stage, b.accepted_by, b.accepted_at IS NOT NULL AND p.release_requested_at IS NOT NULL
			AND p.released_at IS NOT NULL AND p.last_release_error IS NULL AS released
		FROM booking b JOIN payment p ON p.booking_id = b.id WHERE b.id = ANY($1)`,
		[ids]
	);
	expect(accepted).toEqual(
		ids.map(() => ({ stage: 'accepted', accepted_by: 'window', released: true }))
	);
	for (const { bookingId, installerEmail } of overdue) {
		// One transfer at the payments fake for the booking, the one the payment row and the
		// ledger's single release posting name.
		const transfers = (
			await payments.transfers.list({ transfer_group: `booking_${bookingId}`, limit: 100 })
		).data;
		expect(transfers, bookingId).toHaveLength(1);
		const [paid] = await query<{ transfer_id: string; payout_cents: number; charge_id: string }>(
			`SELECT transfer_id, payout_cents, charge_id FROM payment WHERE booking_id = $1`,
			[bookingId]
		);
		expect(paid!.transfer_id).toBe(transfers[0]!.id);
		expect(transfers[0]!.amount).toBe(paid!.payout_cents);
		const postings = await query<{ kind: string; reference: string }>(
			`SELECT kind, reference FROM ledger_transaction WHERE booking_id = $1 ORDER BY created_at`,
			[bookingId]
		);
		expect(postings.filter((p) => p.kind === 'release')).toEqual([
			{ kind: 'release', reference: transfers[0]!.id }
		]);
		// The ledger for the booking: nothing left held, and the cash it says the platform keeps is
		// what the provider took less what it transferred (no drift for this booking).
		const charge = await payments.charges.retrieve(paid!.charge_id);
		const [ledger] = await query<{ held: string; cash: string }>(
			`SELECT coalesce(-sum(amount_cents) FILTER (WHERE account = 'owner_funds_held'), 0) AS held,
				coalesce(sum(amount_cents) FILTER (WHERE account = 'platform_cash'), 0) AS cash
			FROM ledger_entry WHERE booking_id = $1`,
			[bookingId]
		);
		expect(Number(ledger!.held), bookingId).toBe(0);
		expect(Number(ledger!.cash), bookingId).toBe(charge.amount - transfers[0]!.amount);
		// One "Confirmed" notice for the installer.
		const [notices] = await query<{ n: string }>(
			`SELECT count(*) AS n FROM notice n JOIN "user" u ON u.id = n.user_id
			WHERE u.email = $1 AND n.text LIKE 'Confirmed:%'`,
			[installerEmail]
		);
		expect(Number(notices!.n), installerEmail).toBe(1);
	}
	// The whole ledger is sound: every transaction balances, no booking holds less than nothing.
	expect(
		await query(
			`SELECT t.id::text FROM ledger_transaction t LEFT JOIN ledger_entry e ON e.transaction_id = t.id
			GROUP BY t.id HAVING coalesce(sum(e.amount_cents), 0) <> 0 OR count(e.id) < 2
			UNION ALL
			SELECT booking_id::text FROM ledger_entry
			WHERE account = 'owner_funds_held' AND booking_id IS NOT NULL
			GROUP BY booking_id HAVING sum(amount_cents) > 0`
		)
	).toEqual([]);

	// The e-mails: the owner's and the installer's "Confirmed" and the installer's payout, each
	// queued once and delivered once.
	const addresses = overdue.flatMap((o) => [o.ownerEmail, o.installerEmail]);
	const unsent = async () =>
		Number(
			(
				await query<{ n: string }>(
					`SELECT count(*) AS n FROM email_outbox WHERE to_address = ANY($1) AND sent_at IS NULL`,
					[addresses]
				)
			)[0]!.n
		);
	await expect.poll(unsent, { timeout: 60_000 }).toBe(0);
	const inbox = async (email: string) =>
		(
			(await (await fetch(`${MAIL_API}/api/messages?to=${encodeURIComponent(email)}`)).json()) as {
				subject: string;
			}[]
		).map((m) => m.subject);
	for (const { title, ownerEmail, installerEmail } of overdue) {
		const owner = await inbox(ownerEmail);
		expect(
			owner.filter((s) => s === `Confirmed: ${title}`),
			ownerEmail
		).toHaveLength(1);
		const installer = await inbox(installerEmail);
		expect(
			installer.filter((s) => s === `Confirmed: ${title}`),
			installerEmail
		).toHaveLength(1);
		expect(
			installer.filter((s) => s.startsWith('Payout sent:') && s.endsWith(`for the ${title}`)),
			installerEmail
		).toHaveLength(1);
	}
	expect(
		await query(
			`SELECT template, count(*)::int AS n FROM email_outbox
			WHERE to_address = ANY($1) AND template IN ('work-confirmed', 'payout-sent')
			GROUP BY template ORDER BY template`,
			[addresses]
		)
	).toEqual([
		{ template: 'payout-sent', n: overdue.length },
		{ template: 'work-confirmed', n: 2 * overdue.length }
	]);
	expect(second.process.exitCode, second.output()).toBeNull();
});

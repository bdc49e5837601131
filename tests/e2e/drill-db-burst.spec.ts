/**
 * Fault drill (issue 17): PostgreSQL stopped and started in the middle of a burst of writes.
 * An installer's questions to an owner are posted at an app process of its own in waves: one in
 * flight while the cluster stops, one while it is down, one around its start, one after.
 * Every request either completed (303) or was refused with 503; the same process serves again;
 * and nothing is half-written: each question saved has its e-mail in the outbox (one transaction),
 * and the questions saved are exactly as many as the 303 answers.
 */
import { DEMO_PASSWORD, expect, test } from './fixtures';
import { startOwnApp, type OwnApp } from './support/own-app';
import { testCluster, type Cluster } from './support/postgres';
import { closeQueries, query } from './support/requests';

let app: OwnApp | undefined;
let cluster: Cluster | undefined;

test.afterAll(async () => {
	if (cluster && !cluster.isRunning()) cluster.start();
	if (app && (app.process.exitCode !== null || app.process.signalCode !== null)) {
		console.error(
			`The app ended (${String(app.process.exitCode ?? app.process.signalCode)}):\n${app.output()}`
		);
	}
	await app?.stop();
	await closeQueries();
});

// Demo installers the other specs do not sign in as, so their message allowance is untouched.
const CANDIDATES = [
	'bao.tran@tapline.test',
	'cormac.lynd@tapline.test',
	'sione.latu@tapline.test',
	'hattie.brun@tapline.test'
];

test('a burst of writes through a PostgreSQL restart: 303 or 503 each, nothing half-written', async () => {
	test.setTimeout(180_000);
	cluster = await testCluster();
	app = await startOwnApp(29, {});
	const base = app.url;
	const run = `drill-${Date.now().toString(36)}`;

	const signIn = async (email: string) => {
		const res = await fetch(`${base}/sign-in`, {
			method: 'POST',
			body: new URLSearchParams({ email, password: DEMO_PASSWORD }),
			headers: { origin: base, accept: 'text/html' },
			redirect: 'manual'
		});
		expect(res.status, email).toBe(303);
		return res.headers
			.getSetCookie()
			.map((c) => c.split(';')[0])
			.join('; ');
	};
	const ask = (cookie: string, jobId: string, body: string) =>
		fetch(`${base}/installer/jobs/${jobId}?/ask`, {
			method: 'POST',
			body: new URLSearchParams({ body }),
			headers: { origin: base, accept: 'text/html', cookie },
			redirect: 'manual'
		});

	// An installer and an open job they may ask about (the job board's reach decides).
	const jobs = await query<{ id: string }>(
		`SELECT id FROM job WHERE status = 'collecting_quotes' ORDER BY created_at LIMIT 6`
	);
	let target: { cookie: string; jobId: string } | undefined;
	for (const email of CANDIDATES) {
		const cookie = await signIn(email);
		for (const { id } of jobs) {
			if ((await ask(cookie, id, `${run} first question`)).status === 303) {
				target = { cookie, jobId: id };
				break;
			}
		}
		if (target) break;
	}
	if (!target) throw new Error('no demo installer may ask about a demo job');
	const { cookie, jobId } = target;

	let n = 0;
	const statuses: number[] = [];
	const wave = (size: number) =>
		Array.from({ length: size }, () =>
			ask(cookie, jobId, `${run} question ${String(++n)}`).then(
				(res) => {
					statuses.push(res.status);
					return res.status;
				},
				(err: unknown) => {
					// A connection the app dropped would be a failure of its own: keep it visible.
					statuses.push(0);
					const ended = app?.process.exitCode ?? app?.process.signalCode ?? 'still running';
					throw new Error(`request failed; the app: ${String(ended)}`, { cause: err });
				}
			)
		);

	// In flight while the cluster stops (pg_ctl -m fast ends every open transaction): once the
	// first of the wave is answered, the others are at the app (pg_ctl blocks this process, not it).
	const stopping = wave(12);
	await Promise.race(stopping);
	cluster.stop();
	let restarted = false;
	try {
		await Promise.all(stopping);
		// While it is down: every one refused, none half-done.
		const down = await Promise.all(wave(8));
		expect(down.every((s) => s === 503)).toBe(true);
		expect(app.process.exitCode, app.output()).toBeNull();
		// Sent just before it starts again (answered while it starts or after).
		const starting = wave(8);
		await Promise.race(starting);
		cluster.start();
		restarted = true;
		await Promise.all(starting);
	} finally {
		if (!restarted) cluster.start();
	}

	// The same process serves again, without a restart.
	await expect
		.poll(
			async () =>
				(
					await fetch(`${base}/installer/jobs/${jobId}`, {
						headers: { cookie, accept: 'text/html' },
						redirect: 'manual'
					})
				).status,
			{ timeout: 30_000 }
		)
		.toBe(200);
	const after = await Promise.all(wave(4));
	expect(after).toEqual([303, 303, 303, 303]);
	expect(app.process.exitCode, app.output()).toBeNull();

	const tally = (code: number) => statuses.filter((s) => s === code).length;
	console.log(
		`drill-db-burst: ${String(tally(303))} completed, ${String(tally(503))} refused with 503`
	);
	// Every answer was a completion or a 503; no 500, no dropped connection.
	expect(statuses.filter((s) => s !== 303 && s !== 503)).toEqual([]);
	expect(statuses.filter((s) => s === 503).length).toBeGreaterThanOrEqual(8);

	// Nothing half-written: as many questions saved as 303s, each with its e-mail.
	const saved = await query<{ body: string; mailed: boolean }>(
		`SELECT m.body, EXISTS (
			SELECT 1 FROM email_outbox o
			WHERE o.template = 'job-message' AND o.text LIKE '%' || m.body || '%'
		) AS mailed
		FROM job_message m WHERE m.job_id = $1 AND m.body LIKE $2`,
		[jobId, `${run} question %`]
	);
	expect(saved.length).toBe(statuses.filter((s) => s === 303).length);
	expect(saved.filter((m) => !m.mailed)).toEqual([]);
});

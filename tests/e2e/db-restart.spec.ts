/**
 * The app rides through a PostgreSQL restart (issue 11, item 3): a real stop and start of the
 * test cluster with pg_ctl. While the database is away, requests answer 503 with a retry message;
 * afterwards the same process serves again. The app under test here is a process of its own, so
 * its exit (the failure this guards against) is seen directly; the suite's main app rides through
 * the same restart and serves the specs that follow.
 */
import { DEMO, DEMO_PASSWORD, expect, test } from './fixtures';
import { startOwnApp, type OwnApp } from './support/own-app';
import { testCluster, type Cluster } from './support/postgres';
import { query, closeQueries } from './support/requests';

let app: OwnApp | undefined;
let cluster: Cluster | undefined;

test.afterAll(async () => {
	// Whatever happened, leave the cluster running for the specs after this one.
	if (cluster && !cluster.isRunning()) cluster.start();
	await app?.stop();
	await closeQueries();
});

test('requests answer 503 while PostgreSQL restarts, and the same process serves afterwards', async () => {
	test.setTimeout(120_000);
	cluster = await testCluster();
	app = await startOwnApp(17, {});
	const base = app.url;
	const [installer] = await query<{ user_id: string }>(
		`SELECT user_id FROM installer_profile WHERE vetting_status = 'approved' LIMIT 1`
	);
	const profile = `${base}/installers/${installer!.user_id}`;

	// Signed in, with the session cookie carried by hand (plain fetch, no browser).
	const postSignIn = () =>
		fetch(`${base}/sign-in`, {
			method: 'POST',
			body: new URLSearchParams({ email: DEMO.owner, password: DEMO_PASSWORD }),
			headers: { origin: base, accept: 'text/html' },
			redirect: 'manual'
		});
	const signIn = await postSignIn();
	expect(signIn.status).toBe(303);
	const cookie = signIn.headers
		.getSetCookie()
		.map((c) => c.split(';')[0])
		.join('; ');
	const get = (url: string) =>
		fetch(url, { headers: { cookie, accept: 'text/html' }, redirect: 'manual' });
	expect((await get(`${base}/owner`)).status).toBe(200);
	expect((await fetch(profile)).status).toBe(200);

	cluster.stop();
	try {
		// The pool's idle connections were just closed by the server; the process must still be here.
		await new Promise((r) => setTimeout(r, 1_000));
		expect(app.process.exitCode, app.output()).toBeNull();

		const anonymousPage = await fetch(profile, { headers: { accept: 'text/html' } });
		expect(anonymousPage.status).toBe(503);
		expect(anonymousPage.headers.get('retry-after')).toBe('30');
		expect(await anonymousPage.text()).toContain('cannot reach its database just now');

		const signedInPage = await get(`${base}/owner`);
		expect(signedInPage.status).toBe(503);
		expect(signedInPage.headers.get('retry-after')).toBe('30');
		expect(await signedInPage.text()).toContain('try again in a minute');

		// A form action whose first query fails.
		expect((await postSignIn()).status).toBe(503);

		const api = await fetch(`${base}/api/jobs`, {
			headers: { cookie, accept: 'application/json' }
		});
		expect(api.status).toBe(503);
		expect(api.headers.get('retry-after')).toBe('30');
		expect(((await api.json()) as { message: string }).message).toContain('try again');
		expect(app.process.exitCode, app.output()).toBeNull();
	} finally {
		cluster.start();
	}

	// Back: the same process serves the signed-in page and the public one again.
	await expect.poll(async () => (await get(`${base}/owner`)).status, { timeout: 30_000 }).toBe(200);
	expect((await fetch(profile)).status).toBe(200);
	expect(app.process.exitCode, app.output()).toBeNull();
});

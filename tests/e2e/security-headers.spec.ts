/**
 * Response headers (issue 11, item 11): a Content-Security-Policy on every page with a nonce on
 * SvelteKit's scripts, maps and forms working under it, private no-store answers for signed-in
 * pages and the JSON API, HSTS when the origin is https, a Permissions-Policy.
 */
import { expect, test } from './fixtures';
import { startOwnApp } from './support/own-app';
import { closeQueries, query } from './support/requests';

test.afterAll(closeQueries);

const tileOrigin = new URL(
	(process.env.PUBLIC_TILE_URL ?? 'http://127.0.0.1:2595/{z}/{x}/{y}.png').replace(/\{\w\}/g, '0')
).origin;

test('every page carries the policy, and every script on it the policy’s nonce', async ({
	request
}) => {
	const [installer] = await query<{ user_id: string }>(
		`SELECT user_id FROM installer_profile WHERE vetting_status = 'approved' LIMIT 1`
	);
	for (const path of [
		'/',
		'/sign-in',
		'/sign-up',
		`/installers/${installer!.user_id}`,
		'/no-such-page'
	]) {
		const res = await request.get(path);
		const headers = res.headers();
		const csp = headers['content-security-policy'] ?? '';
		expect({ path, csp }).toEqual({ path, csp: expect.stringContaining("default-src 'self'") });
		expect(csp).toMatch(/script-src 'self' 'nonce-[\w+/=]+'/);
		expect(csp).toContain("object-src 'none'");
		expect(csp).toContain("frame-ancestors 'none'");
		expect(csp).toContain("base-uri 'self'");
		expect(csp).toContain(`img-src 'self' data: blob: ${tileOrigin}`);
		const nonce = csp.match(/'nonce-([^']+)'/)![1];
		const scripts = (await res.text()).match(/<script\b[^>]*>/g) ?? [];
		expect(scripts.length).toBeGreaterThan(0);
		for (const tag of scripts) expect(tag).toContain(`nonce="${nonce}"`);

		expect(headers['permissions-policy']).toContain('camera=()');
		expect(headers['x-content-type-options']).toBe('nosniff');
		// Served over http here: no HSTS (see the https test below).
		expect(headers['strict-transport-security']).toBeUndefined();
		// Nobody is signed in: no private caching rule forced on public pages.
		expect(headers['cache-control'] ?? '').not.toContain('no-store');
	}
	// A fresh nonce per response.
	const nonceOf = async () =>
		(await request.get('/')).headers()['content-security-policy']!.match(/'nonce-([^']+)'/)![1];
	expect(await nonceOf()).not.toBe(await nonceOf());
});

test('signed-in pages, their data and the JSON API are private and never stored', async ({
	installerPage: page
}) => {
	for (const path of [
		'/installer',
		'/installer/jobs',
		'/installer/__data.json',
		'/api/jobs',
		'/api/places?q=Norwood'
	]) {
		const res = await page.request.get(path);
		expect({ path, status: res.status(), cache: res.headers()['cache-control'] }).toEqual({
			path,
			status: 200,
			cache: 'private, no-store'
		});
	}
});

test('the maps load their tiles, and forms submit, under the policy', async ({
	installerPage: page,
	cspViolations
}) => {
	await page.goto('/installer/jobs');
	await expect(page.getByTestId('job-map')).toBeVisible();
	await expect(page.locator('img.leaflet-tile-loaded').first()).toBeVisible();
	await page.goto('/installer/service-area');
	await expect(page.locator('img.leaflet-tile-loaded').first()).toBeVisible();
	// A superforms form with use:enhance (client-side JavaScript) still submits.
	await page.goto('/installer/hours');
	await page.getByRole('button', { name: 'Save hours' }).click();
	await expect(page.getByText('Working hours saved.')).toBeVisible();
	expect(cspViolations).toEqual([]);
});

test('HSTS is sent when the site is served over https', async () => {
	const app = await startOwnApp(19, {
		ORIGIN: 'https://tapline.example.test',
		TAPLINE_WORKER: 'off'
	});
	try {
		const res = await fetch(`${app.url}/`);
		expect(res.status).toBe(200);
		expect(res.headers.get('strict-transport-security')).toBe(
			'max-age=63072000; includeSubDomains'
		);
	} finally {
		await app.stop();
	}
});

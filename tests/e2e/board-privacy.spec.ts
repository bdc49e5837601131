/**
 * The job board's JSON as the demo installer gets it (issue 9): no open job's true point appears
 * in /api/jobs, with or without the map's clusters, and the clusters add up to the total.
 */
import { expect, test } from './fixtures';
import { closeQueries, query } from './support/requests';

test.afterAll(closeQueries);

test('no answer of /api/jobs carries a true point before booking', async ({ installerPage }) => {
	const open = await query<{ latitude: number; longitude: number }>(
		`SELECT latitude, longitude FROM job WHERE status = 'collecting_quotes'`
	);
	expect(open.length).toBeGreaterThan(0);
	let listed = 0;
	for (const path of [
		'/api/jobs?limit=100',
		'/api/jobs?limit=100&zoom=16',
		'/api/jobs?limit=100&zoom=8&sort=newest'
	]) {
		const res = await installerPage.request.get(path);
		expect(res.status()).toBe(200);
		const text = await res.text();
		const body = JSON.parse(text) as {
			jobs: unknown[];
			total: number;
			clusters: Array<{ count: number }> | null;
		};
		listed += body.jobs.length;
		if (body.clusters) {
			expect(body.clusters.reduce((n, c) => n + c.count, 0)).toBe(body.total);
		}
		for (const p of open) {
			// Four decimals is about 10 m; the cell centres the board shows are 1 km apart.
			expect(text).not.toContain(p.latitude.toFixed(4));
			expect(text).not.toContain(p.longitude.toFixed(4));
		}
	}
	expect(listed).toBeGreaterThan(0);
});

/**
 * Only admins reach the admin console: every page, form action and endpoint under /admin, found
 * in the route tree (so a route added later is checked too), asked for by an anonymous visitor
 * (sent to sign in), the demo owner and the demo installer (403 each, at the page and at the
 * action), with the money, settings and audit tables unchanged by all of it.
 */
import { DEMO, expect, test } from './fixtures';
import { BASE_URL, BROWSER_HEADERS, closeQueries, query, signedIn } from './support/requests';
import { fillPattern, routeTargets, targetName } from './support/routes';

test.afterAll(closeQueries);

const WATCHED = [
	'admin_audit',
	'market_setting',
	'payment',
	'ledger_transaction',
	'dispute',
	'installer_profile',
	'"user"'
];

async function checksums() {
	const sums: Record<string, string> = {};
	for (const table of WATCHED) {
		const [row] = await query<{ sum: string | null }>(
			`SELECT md5(string_agg(t::text, '|' ORDER BY t::text)) AS sum FROM ${table} t`
		);
		sums[table] = row?.sum ?? '';
	}
	return sums;
}

test('every admin page, action and endpoint refuses anyone but an admin', async ({ browser }) => {
	test.setTimeout(120_000);
	const targets = routeTargets().filter((t) => t.group === 'admin');
	// The console has an overview, queues, bookings, payouts, accounts, settings and the team.
	expect(targets.length).toBeGreaterThan(20);
	const anonymous = await browser.newContext({ baseURL: BASE_URL });
	const owner = await signedIn(browser, DEMO.owner);
	const installer = await signedIn(browser, DEMO.installer);
	const before = await checksums();
	const answers: string[] = [];
	for (const target of targets) {
		const path = fillPattern(
			target.pattern,
			Object.fromEntries(target.params.map((p) => [p.name, crypto.randomUUID()]))
		);
		const url = target.kind === 'action' ? `${path}?/${target.action ?? 'default'}` : path;
		for (const [who, context] of [
			['anonymous', anonymous],
			['owner', owner],
			['installer', installer]
		] as const) {
			const res =
				target.method === 'GET'
					? await context.request.get(url, { maxRedirects: 0 })
					: await context.request.fetch(url, {
							method: target.method,
							form: { reason: 'Not an admin trying', confirm: 'on' },
							headers: BROWSER_HEADERS,
							maxRedirects: 0
						});
			const status = res.status();
			const name = `${who} ${targetName(target)}`;
			if (who === 'anonymous') {
				expect([303, 401, 403], name).toContain(status);
				if (status === 303) expect(res.headers()['location'], name).toContain('/sign-in');
			} else {
				expect(status, name).toBe(403);
				expect(await res.text(), name).not.toMatch(/\bat [\w$.]+ \(|node_modules/);
			}
			answers.push(name);
		}
	}
	expect(answers).toHaveLength(targets.length * 3);
	expect(await checksums()).toEqual(before);
	await Promise.all([anonymous.close(), owner.close(), installer.close()]);
});

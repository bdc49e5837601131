/**
 * `npm run bench`, the job board at market scale: builds a generated market (10,000 installers
 * with varied circles and skills, 100,000 open jobs over a 60 km disc around Adelaide, 200,000
 * quotes) in a throw-away database on the test cluster, starts the built app on loopback and
 * measures GET /api/jobs (whole circle, circle with the map's clusters, a 5 km view, filters, a
 * later page by cursor), the board page, and a bare SvelteKit JSON route of the same server, with
 * autocannon (10 connections). Prints p50/p95/p99 and requests per second as ratios to the bare
 * route, the board page's Largest Contentful Paint in Chromium, and EXPLAIN (ANALYZE, BUFFERS)
 * of the board's queries; writes it all to bench/RESULTS.md with the machine described.
 * Invented data only. Reports; never fails on a timing.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import autocannon from 'autocannon';
import { PgDialect } from 'drizzle-orm/pg-core';
import { sql, type SQL } from 'drizzle-orm';
import pg from 'pg';
import { appEnv, loadConfig, ROOT } from '../scripts/lib/config.mjs';
import { ensureCluster } from '../scripts/lib/postgres.mjs';
import { dropDatabase, ensureDatabase, migrateDatabase } from '../scripts/lib/database.mjs';
import { ensureBuild } from '../scripts/lib/build.mjs';
import {
	boardClustersSql,
	boardPageSql,
	boardQuerySchema,
	boardTotalSql,
	REACHES,
	type BoardInstaller
} from '../src/lib/server/marketplace/board-sql';
import { requiredSkills } from '../src/lib/marketplace/matching';
import { BODY_STYLES, CAMERA_SETUPS, POWER_MODES } from '../src/lib/scope/request';
import { INSTALLER_SKILLS } from '../src/lib/people/vetting';

const INSTALLERS = 10_000;
const JOBS = 100_000;
const QUOTES_PER_JOB = 2; // 200,000 quotes
const CONNECTIONS = 10;
const DURATION_S = Number(process.env.BENCH_DURATION_S ?? 10);
// Adelaide's centre and the demo installer's base near Norwood (from memory, to about 0.01°).
const ADELAIDE = { lat: -34.9285, lng: 138.6007 };
const DEMO_BASE = { lat: -34.921, lng: 138.63 };
// Lucia's session ids are 20–64 lower-case letters and digits (readSession refuses others).
const SESSION = 'benchsessiondemoinstaller000000';

const say = (s: string) => console.log(`\x1b[33m▸\x1b[0m ${s}`);
const config = loadConfig('test');
// BENCH_DATABASE names a market to keep and reuse between runs (built once, never dropped).
const kept = process.env.BENCH_DATABASE;
const database = kept ?? `tapline_bench_${String(process.pid)}`;
const databaseUrl: string = config.dbUrl(database);
const dialect = new PgDialect();

/** The market, generated in SQL (seeded, so every run builds the same one). */
async function buildMarket(client: pg.Client) {
	const combos = BODY_STYLES.flatMap((bodyStyle) =>
		CAMERA_SETUPS.flatMap((cameras) =>
			POWER_MODES.map((power) => ({
				bodyStyle,
				cameras,
				power,
				skills: requiredSkills({ bodyStyle, cameras, power })
			}))
		)
	);
	await client.query(`select setseed(0.42)`);
	await client.query(
		`create temp table combo as select c.* from jsonb_to_recordset($1::jsonb)
			as c(idx int, body_style text, cameras text, power text, skills text[])`,
		[
			JSON.stringify(
				combos.map((c, idx) => ({
					idx,
					body_style: c.bodyStyle,
					cameras: c.cameras,
					power: c.power,
					skills: c.skills
				}))
			)
		]
	);
	// A point in the 60 km disc round Adelaide: uniform in area (√ of a uniform for the distance).
	const disc = (d: string, b: string) =>
		`${String(ADELAIDE.lat)} + (${d} / 111.195) * cos(${b}) as lat,
		 ${String(ADELAIDE.lng)} + (${d} / (111.195 * cos(radians(${String(ADELAIDE.lat)})))) * sin(${b}) as lng`;
	await client.query(`insert into "user" (id, email, password_hash, role, display_name, email_verified_at)
		select 'owner-' || g, 'owner' || g || '@bench.test', 'unused', 'owner'::user_role, 'Bench owner ' || g, now()
		from generate_series(1, 20000) g
		union all
		select 'inst-' || g, 'inst' || g || '@bench.test', 'unused', 'installer'::user_role, 'Bench installer ' || g, now()
		from generate_series(1, ${String(INSTALLERS)}) g`);
	await client.query(`insert into installer_profile (user_id, business_name, skills, suburb, postcode,
			latitude, longitude, service_radius_km, offers_mobile, offers_workshop, vetting_status, submitted_at)
		select 'inst-' || g, 'Bench Fitting ' || g,
			array(select s from unnest(array[${INSTALLER_SKILLS.map((s) => `'${s}'`).join(',')}]) s
				where random() < 0.6 and g > 0),
			'Adelaide', '5000', p.lat, p.lng, 5 + floor(random() * 56)::int, random() < 0.8,
			random() < 0.4, 'approved'::vetting_status, now()
		from (select g, ${disc('60 * sqrt(random())', '2 * pi() * random()')}
			from generate_series(1, ${String(INSTALLERS)}) g) p`);
	// The installer the requests are made as: 30 km circle, every skill, both ways of working.
	await client.query(`insert into "user" (id, email, password_hash, role, display_name, email_verified_at)
		values ('inst-demo', 'demo@bench.test', 'unused', 'installer', 'Bench demo installer', now())`);
	await client.query(
		`insert into installer_profile (user_id, business_name, skills, suburb, postcode, latitude,
			longitude, service_radius_km, offers_mobile, offers_workshop, vetting_status, submitted_at)
		values ('inst-demo', 'Bench Demo Fitting', $1::text[], 'Norwood', '5067', $2, $3, 30, true, true,
			'approved', now())`,
		[`{${INSTALLER_SKILLS.join(',')}}`, DEMO_BASE.lat, DEMO_BASE.lng]
	);
	await client.query(`insert into job (owner_id, status, draft_step, title, body_style, cameras, power,
			required_skills, location_mode, suburb, postcode, latitude, longitude, preferred_windows,
			price_low_cents, price_high_cents, scope_summary, submitted_at)
		select 'owner-' || (1 + g % 20000), 'collecting_quotes'::job_status, 'review', 'Bench job ' || g,
			c.body_style, c.cameras, c.power, c.skills,
			case when s.r3 < 0.7 then 'mobile' else 'workshop' end, 'Adelaide', '5000', s.lat, s.lng,
			jsonb_build_array(jsonb_build_object('date',
				to_char(current_date + (1 + floor(s.r4 * 30))::int, 'YYYY-MM-DD'), 'window', 'morning')),
			25000, 45000, '110–210 min, 31 parts', now() - s.r5 * interval '30 days'
		from (select g, floor(random() * ${String(combos.length)})::int as k, random() as r3,
				random() as r4, random() as r5, ${disc('60 * sqrt(random())', '2 * pi() * random()')}
			from generate_series(1, ${String(JOBS)}) g) s
		join combo c on c.idx = s.k`);
	// Quotes in bulk with the count trigger off, then the counts in one statement: the same
	// numbers the trigger would keep. Two installers a job; the demo installer quotes 500 of
	// the jobs nearest to them instead of a second installer.
	await client.query(`alter table quote disable trigger quote_live_count`);
	await client.query(`create temp table demo_quoted as
		select id from job order by approx_location <-> st_setsrid(st_makepoint(${String(DEMO_BASE.lng)},
			${String(DEMO_BASE.lat)}), 4326)::geography limit 500`);
	await client.query(`insert into quote (job_id, installer_id, status, total_cents)
		select j.id, case when n = 2 and d.id is not null then 'inst-demo'
				else 'inst-' || (1 + ((hashtext(j.id::text)::bigint & 2147483647) + (n - 1) * 5000) % ${String(INSTALLERS)}) end,
			(case when random() < 0.85 then 'live' else 'withdrawn' end)::quote_status, 30000
		from job j cross join generate_series(1, ${String(QUOTES_PER_JOB)}) n
		left join demo_quoted d on d.id = j.id`);
	await client.query(`update job set live_quotes = c.n
		from (select job_id, count(*)::int as n from quote where status = 'live' group by job_id) c
		where c.job_id = job.id`);
	await client.query(`alter table quote enable trigger quote_live_count`);
	await client.query(`insert into session (id, user_id, expires_at)
		values ('${SESSION}', 'inst-demo', now() + interval '30 days')`);
	await client.query(`vacuum analyze`);
}

/** Starts the built app on its own port against the bench database, and waits until it answers. */
async function startApp(buildDir: string, port: number): Promise<ChildProcess> {
	const env = {
		...process.env,
		...appEnv(config, databaseUrl),
		PORT: String(port),
		ORIGIN: `http://127.0.0.1:${String(port)}`,
		TAPLINE_WORKER: 'off',
		// serves /api/bench/baseline, which the app answers only when the benchmark started it
		TAPLINE_BENCH: 'on'
	};
	const app = spawn(process.execPath, [path.join(ROOT, buildDir, 'index.js')], {
		env,
		stdio: ['ignore', 'ignore', 'inherit']
	});
	for (let i = 0; i < 200; i++) {
		try {
			const res = await fetch(`http://127.0.0.1:${String(port)}/api/bench/baseline`);
			if (res.ok) return app;
		} catch {
			// not listening yet
		}
		await new Promise((r) => setTimeout(r, 250));
	}
	app.kill('SIGTERM');
	throw new Error('the app did not start');
}

interface Measured {
	name: string;
	path: string;
	p50: number;
	p95: number;
	p99: number;
	rps: number;
	non2xx: number;
	statuses: string;
}

/** autocannon with every response time kept, so p95 is exact (autocannon itself reports p97.5). */
async function load(name: string, url: string): Promise<Measured> {
	const times: number[] = [];
	const statuses = new Map<number, number>();
	const run = (duration: number) =>
		new Promise<autocannon.Result>((resolve, reject) => {
			const instance = autocannon(
				{
					url,
					connections: CONNECTIONS,
					duration,
					headers: { cookie: `tapline_session=${SESSION}` }
				},
				(err, result) => (err ? reject(err) : resolve(result))
			);
			instance.on('response', (_client, status, _bytes, responseTime) => {
				if (duration !== DURATION_S) return;
				times.push(responseTime);
				statuses.set(status, (statuses.get(status) ?? 0) + 1);
			});
		});
	await run(2); // warm-up
	const result = await run(DURATION_S);
	times.sort((a, b) => a - b);
	const at = (q: number) => times[Math.min(times.length - 1, Math.floor(q * times.length))] ?? 0;
	return {
		name,
		path: url.replace(/^http:\/\/[^/]+/, ''),
		p50: at(0.5),
		p95: at(0.95),
		p99: at(0.99),
		rps: result.requests.average,
		non2xx: result.non2xx,
		statuses: [...statuses].map(([code, n]) => `${String(code)}: ${String(n)}`).join(', ')
	};
}

/** The board page's Largest Contentful Paint in Debian's Chromium, median of five loads. */
async function largestContentfulPaint(origin: string): Promise<number[]> {
	const { chromium } = await import('@playwright/test');
	const browser = await chromium.launch({ executablePath: '/usr/bin/chromium' });
	try {
		const context = await browser.newContext();
		await context.addCookies([{ name: 'tapline_session', value: SESSION, url: origin }]);
		const page = await context.newPage();
		const paints: number[] = [];
		for (let i = 0; i < 5; i++) {
			await page.goto(`${origin}/installer/jobs`, { waitUntil: 'load' });
			paints.push(
				await page.evaluate(
					() =>
						new Promise<number>((resolve) => {
							new PerformanceObserver((list) => {
								const entries = list.getEntries();
								resolve(entries[entries.length - 1]?.startTime ?? 0);
							}).observe({ type: 'largest-contentful-paint', buffered: true });
						})
				)
			);
		}
		return paints.sort((a, b) => a - b);
	} finally {
		await browser.close();
	}
}

async function explain(client: pg.Client, statement: SQL): Promise<string> {
	const query = dialect.sqlToQuery(statement);
	const { rows } = await client.query<{ 'QUERY PLAN': string }>(
		`explain (analyze, buffers) ${query.sql}`,
		query.params
	);
	return rows.map((r) => r['QUERY PLAN']).join('\n');
}

async function main() {
	const cluster = ensureCluster(config, { say });
	let app: ChildProcess | undefined;
	// The settings of the app's pool (src/lib/server/db/index.ts), so the plans are the app's.
	const client = new pg.Client({
		connectionString: databaseUrl,
		options: '-c jit=off -c max_parallel_workers_per_gather=0'
	});
	try {
		say(`Database ${database} on the test cluster (port ${String(config.pgPort)})`);
		await ensureDatabase(config.adminUrl, database);
		await migrateDatabase(databaseUrl);
		await client.connect();
		const t0 = performance.now();
		const built = await client.query(`select 1 from installer_profile limit 1`);
		if (built.rowCount === 0) await buildMarket(client);
		const buildSeconds = (performance.now() - t0) / 1000;
		say(`Market ready in ${buildSeconds.toFixed(0)} s`);

		const buildDir = 'build-bench';
		say('Building the app (skipped when current)…');
		await ensureBuild(
			{ ...process.env, TAPLINE_BUILD_DIR: buildDir, TAPLINE_KIT_DIR: '.svelte-kit-bench' },
			{
				run: (cmd: string, args: string[], options: { env?: Record<string, string> }) =>
					new Promise<void>((resolve, reject) => {
						const child = spawn(cmd, args, {
							cwd: ROOT,
							stdio: 'ignore',
							env: { ...process.env, ...options.env }
						});
						child.on('exit', (code) =>
							code === 0 ? resolve() : reject(new Error(`${cmd} exited ${String(code)}`))
						);
					})
			}
		);
		const port = config.appPort + 7;
		app = await startApp(buildDir, port);
		const origin = `http://127.0.0.1:${String(port)}`;

		const counts = (
			await client.query<{ jobs: number; installers: number; quotes: number; offered: number }>(
				`select (select count(*)::int from job where status = 'collecting_quotes') as jobs,
					(select count(*)::int from installer_profile) as installers,
					(select count(*)::int from quote) as quotes, 0 as offered`
			)
		).rows[0]!;
		const demo: BoardInstaller = {
			id: 'inst-demo',
			base: DEMO_BASE,
			serviceRadiusKm: 30,
			skills: [...INSTALLER_SKILLS],
			offersMobile: true,
			offersWorkshop: true
		};
		const offered = await client.query<{ n: number }>(
			dialect.sqlToQuery(boardTotalSql(demo, boardQuerySchema.parse({}))).sql,
			dialect.sqlToQuery(boardTotalSql(demo, boardQuerySchema.parse({}))).params
		);
		counts.offered = offered.rows[0]!.n;

		// A 5 km view (about 4.4 km by 5 km) just north-east of the city centre.
		const view = '138.59,-34.93,138.645,-34.89';
		const circleView = '138.30,-35.20,138.96,-34.65';
		const first = (await (
			await fetch(`${origin}/api/jobs?limit=25`, {
				headers: { cookie: `tapline_session=${SESSION}` }
			})
		).json()) as { nextCursor: string };
		let cursor = first.nextCursor;
		for (let i = 0; i < 3; i++) {
			const next = (await (
				await fetch(`${origin}/api/jobs?limit=25&cursor=${encodeURIComponent(cursor)}`, {
					headers: { cookie: `tapline_session=${SESSION}` }
				})
			).json()) as { nextCursor: string };
			cursor = next.nextCursor;
		}
		const cases: Array<[string, string]> = [
			['bare SvelteKit JSON route (baseline)', '/api/bench/baseline'],
			['/api/jobs whole circle, first page with total', '/api/jobs?limit=25'],
			[
				'/api/jobs whole circle as the map asks (bounds, zoom 10, clusters)',
				`/api/jobs?limit=25&zoom=10&bounds=${circleView}`
			],
			['/api/jobs 5 km view (zoom 14, clusters)', `/api/jobs?limit=25&zoom=14&bounds=${view}`],
			[
				'/api/jobs with filters (hatchback, parking, ≤ 20 km, unquoted, newest)',
				'/api/jobs?limit=25&bodyStyle=hatchback&power=hardwired-parking&maxKm=20&unquoted=1&sort=newest'
			],
			[
				'/api/jobs 5th page by cursor (nearest first)',
				`/api/jobs?limit=25&cursor=${encodeURIComponent(cursor)}`
			],
			['/installer/jobs board page (server render)', '/installer/jobs']
		];
		const measured: Measured[] = [];
		for (const [name, p] of cases) {
			say(`Measuring ${name}…`);
			measured.push(await load(name, `${origin}${p}`));
		}
		say('Largest Contentful Paint of the board page in Chromium…');
		let paints: number[] = [];
		try {
			paints = await largestContentfulPaint(origin);
		} catch (err) {
			say(`LCP not measured: ${String(err)}`);
		}

		const dq = (q: Record<string, string>) => boardQuerySchema.parse(q);
		const plans: Array<[string, SQL]> = [
			['first page, nearest first (KNN)', boardPageSql(demo, dq({}))!],
			['5th page by cursor, nearest first', boardPageSql(demo, dq({ cursor }))!],
			[
				'first page, filters, newest first',
				boardPageSql(
					demo,
					dq({
						bodyStyle: 'hatchback',
						power: 'hardwired-parking',
						maxKm: '20',
						unquoted: '1',
						sort: 'newest'
					})
				)!
			],
			['first page, soonest date first', boardPageSql(demo, dq({ sort: 'date' }))!],
			['first page, fewest quotes first', boardPageSql(demo, dq({ sort: 'quotes' }))!],
			['5 km view, page', boardPageSql(demo, dq({ bounds: view }))!],
			['5 km view, clusters at zoom 14', boardClustersSql(demo, dq({ bounds: view }), 14)],
			['whole circle, clusters at zoom 10', boardClustersSql(demo, dq({ bounds: circleView }), 10)],
			['whole circle, total', boardTotalSql(demo, dq({}))],
			[
				'which installers one job reaches',
				sql`select p.user_id, p.base <-> j.approx_location as distance_m from job j
					join installer_profile p on ${REACHES}
					where j.id = (select id from job order by id limit 1) order by distance_m`
			],
			[
				'new-jobs digest matching (every installer × the last day of jobs)',
				sql`select count(*) from job j join installer_profile p on ${REACHES}
					where j.status = 'collecting_quotes' and j.submitted_at > now() - interval '1 day'
					and not exists (select 1 from quote q where q.job_id = j.id and q.installer_id = p.user_id)`
			]
		];
		const explained: Array<[string, string]> = [];
		for (const [name, statement] of plans) {
			say(`EXPLAIN ${name}`);
			explained.push([name, await explain(client, statement)]);
		}

		const versions = (
			await client.query<{ pg: string; postgis: string }>(
				`select version() as pg, postgis_lib_version() as postgis`
			)
		).rows[0]!;
		const bare = measured[0]!;
		const ratio = (a: number, b: number) => (b > 0 ? (a / b).toFixed(2) : '–');
		const rows = measured.map(
			(m) =>
				`| ${m.name} | ${m.p50.toFixed(1)} | ${m.p95.toFixed(1)} | ${m.p99.toFixed(1)} | ${m.rps.toFixed(0)} | ${ratio(m.p50, bare.p50)} | ${ratio(m.p95, bare.p95)} | ${ratio(m.rps, bare.rps)} | ${m.statuses} |`
		);
		const seqScans = explained.filter(([, plan]) => /Seq Scan on job\b/.test(plan)).map(([n]) => n);
		const cpus = os.cpus();
		const report = `# Job board benchmark

Written by \`npm run bench\` (bench/board.ts) on ${new Date().toISOString()}.

## Machine

- ${String(cpus.length)} × ${cpus[0]?.model ?? 'unknown CPU'}, ${(os.totalmem() / 2 ** 30).toFixed(1)} GiB RAM, ${os.type()} ${os.release()}
- Node ${process.version}; ${versions.pg}; PostGIS ${versions.postgis}
- The app (adapter-node build, one process, worker off) and PostgreSQL share the machine with
  autocannon; the machine may be shared with other work, which shows in every row alike.

## Market

${String(counts.installers)} installers (${String(INSTALLERS)} with circles of 5–60 km and random skills, plus the
demo installer), ${String(counts.jobs)} open jobs over a 60 km disc around Adelaide, ${String(counts.quotes)} quotes;
built (or found) in ${buildSeconds.toFixed(0)} s. Requests are made as the demo installer (base near Norwood,
30 km circle, every skill): ${String(counts.offered)} jobs offered.

## Requests

autocannon, ${String(CONNECTIONS)} connections, ${String(DURATION_S)} s per case after a 2 s warm-up, on loopback.
Latency in ms; ratios are to the bare route (latency: times slower; throughput: share of its req/s).

| case | p50 | p95 | p99 | req/s | p50 ratio | p95 ratio | req/s ratio | statuses |
| ---- | --: | --: | --: | ----: | --------: | --------: | ----------: | -------- |
${rows.join('\n')}

Board page Largest Contentful Paint (Chromium, loopback, five loads, ms): ${paints.length ? paints.map((p) => p.toFixed(0)).join(', ') : 'not measured'}.

## Query plans

Board queries with a sequential scan of \`job\`: ${seqScans.length ? seqScans.join('; ') : 'none'}.

${explained.map(([name, plan]) => `### ${name}\n\n\`\`\`text\n${plan}\n\`\`\``).join('\n\n')}
`;
		writeFileSync(path.join(ROOT, 'bench', 'RESULTS.md'), report);
		console.log(`\n${rows.join('\n')}`);
		console.log(`LCP ms: ${paints.map((p) => p.toFixed(0)).join(', ')}`);
		console.log(`Sequential scans of job: ${seqScans.length ? seqScans.join('; ') : 'none'}`);
		for (const [name, plan] of explained) console.log(`\n-- ${name}\n${plan}`);
		say('Written to bench/RESULTS.md');
	} finally {
		app?.kill('SIGTERM');
		await client.end().catch(() => undefined);
		if (!kept) await dropDatabase(config.adminUrl, database);
		cluster.stop();
	}
}

await main();

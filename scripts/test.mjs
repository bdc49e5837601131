// `npm test`: the same set-up as `npm start`, on throw-away databases, then every suite:
// svelte-check, lint, Vitest (unit + integration against PostgreSQL), build, Playwright end-to-end,
// and the start script's own tests. Set-up steps print one line each (their output goes to
// .data/logs/test-<shift>.log); the suites print as they run.
import { readFileSync, rmSync } from 'node:fs';
import path from 'node:path';
import { ROOT, appEnv, loadConfig } from './lib/config.mjs';
import * as processes from './lib/processes.mjs';
import { bold, createReport } from './lib/report.mjs';
import { ensureDebianPackages, ensureNodeModules } from './lib/system.mjs';

const config = loadConfig('test');
const shift = config.appPort - 3000;
const report = createReport(
	`npm test, port shift ${shift}`,
	path.join(ROOT, '.data', 'logs', `test-${shift}.log`)
);
// TAPLINE_TEST_STEPS=check,vitest,e2e,start (default: all) runs a subset, e.g. `TAPLINE_TEST_STEPS=e2e npm test`.
const steps = new Set((process.env.TAPLINE_TEST_STEPS ?? 'check,vitest,e2e,start').split(','));
const timings = [];
const failures = [];
const counts = { passed: 0, failed: 0 };
const runId = `${Date.now().toString(36)}${process.pid}`;
const templateDb = `tapline_t${runId}_template`;
const e2eDb = `tapline_t${runId}_e2e`;
const reportDir = path.join(ROOT, 'test-results', `run-${shift}`);
const buildEnv = {
	TAPLINE_BUILD_DIR: `build-test-${shift}`,
	TAPLINE_KIT_DIR: `.svelte-kit-test-${shift}`
};

let cluster = { stop: () => {} };
let db = null;
let cleaning = null;

/** Stops the fakes and the app, drops this run's databases and stops a cluster started here. */
function cleanUp() {
	cleaning ??= (async () => {
		await processes.stopChildren();
		if (db)
			for (const name of [e2eDb, templateDb])
				await db.dropDatabase(config.adminUrl, name).catch(() => {});
		cluster.stop();
	})();
	return cleaning;
}

for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'])
	process.on(signal, () => {
		console.log(`\n${signal}: stopping the test run…`);
		void cleanUp().then(() => process.exit(1));
	});

/** Runs a suite with its output on the console and records its time. */
async function suite(label, fn) {
	console.log(`\n${bold(`▸ ${label}`)}`);
	const t0 = Date.now();
	try {
		return await fn();
	} finally {
		timings.push(`${label}: ${((Date.now() - t0) / 1000).toFixed(1)} s`);
	}
}

/** Runs Vitest with a JSON report and adds its counts. */
async function vitest(args, env) {
	const json = path.join(reportDir, `vitest-${args.join('-').replace(/\W+/g, '')}.json`);
	const ok = await processes.runVisible(
		processes.binPath('vitest'),
		['run', ...args, '--reporter=default', '--reporter=json', `--outputFile.json=${json}`],
		{ env }
	);
	try {
		const r = JSON.parse(readFileSync(json, 'utf8'));
		counts.passed += r.numPassedTests;
		counts.failed += r.numFailedTests;
	} catch {
		failures.push(`vitest report missing (${args.join(' ')})`);
	}
	return ok;
}

async function main() {
	console.log(
		`${bold('Tapline')} · npm test   (installs, build and start-up output: ${report.relLog})`
	);
	await report.step('npm packages', (step) => ensureNodeModules(report.run).then(step.note));
	await report.step('Debian packages', (step) =>
		ensureDebianPackages(
			[
				'postgresql',
				'postgresql-15-postgis-3',
				'chromium',
				'fonts-dejavu-core',
				'fontconfig-config'
			],
			report.run
		).then(step.note)
	);

	const { ensureCluster } = await import('./lib/postgres.mjs');
	db = await import('./lib/database.mjs');
	const { ensureBuild } = await import('./lib/build.mjs');

	await report.step('PostgreSQL', (step) => {
		cluster = ensureCluster(config, { say: report.log });
		step.note(`on 127.0.0.1:${config.pgPort}`);
	});
	rmSync(reportDir, { recursive: true, force: true });
	await report.step('migrations', async () => {
		await db.ensureDatabase(config.adminUrl, templateDb);
		await db.migrateDatabase(config.dbUrl(templateDb));
	});
	const env = appEnv(config, config.dbUrl(e2eDb));

	if (steps.has('check'))
		await suite('svelte-check, Prettier, ESLint', async () => {
			await processes.runVisible(processes.binPath('svelte-kit'), ['sync']);
			if (
				!(await processes.runVisible(processes.binPath('svelte-check'), [
					'--tsconfig',
					'./tsconfig.json',
					'--fail-on-warnings'
				]))
			)
				failures.push('svelte-check');
			if (
				!(await processes.runVisible(processes.binPath('prettier'), [
					'--check',
					'.',
					'--log-level',
					'warn'
				]))
			)
				failures.push('prettier');
			if (!(await processes.runVisible(processes.binPath('eslint'), ['.'])))
				failures.push('eslint');
		});

	if (steps.has('vitest'))
		await suite('Vitest: unit and integration', async () => {
			const ok = await vitest(['--project', 'unit', '--project', 'integration'], {
				TEST_ADMIN_DATABASE_URL: config.adminUrl,
				TEST_TEMPLATE_DATABASE: templateDb,
				TEST_DATABASE_URL_PREFIX: config.dbUrl(''),
				TAPLINE_WORKER: 'off'
			});
			if (!ok) failures.push('vitest');
		});

	if (steps.has('e2e') || steps.has('start'))
		await report.step('build', (step) =>
			ensureBuild({ ...env, ...buildEnv }, { force: steps.has('e2e'), run: report.run }).then(
				step.note
			)
		);

	if (steps.has('e2e')) {
		const fakes = await report.step('local fakes', async () => {
			const child = processes.startChild(
				'fakes',
				processes.binPath('tsx'),
				['local-fakes/index.ts'],
				env,
				{ logFile: report.logFile }
			);
			await processes.waitForChildPorts(child, Object.values(config.fakes), 30_000);
			return child;
		});
		// After the fakes: the seed stores the demo installers' documents in the object store.
		await report.step('e2e database', async (step) => {
			await db.ensureDatabase(config.adminUrl, e2eDb, templateDb);
			step.note(await db.seedDatabase(env.DATABASE_URL, report.run, env));
		});
		const app = await report.step('app', async () => {
			const child = processes.startChild(
				'app',
				process.execPath,
				[buildEnv.TAPLINE_BUILD_DIR],
				env,
				{ logFile: report.logFile }
			);
			await processes.waitForChildPorts(child, [config.appPort], 60_000);
			return child;
		});
		report.printWarnings();
		// The app's and the fakes' errors belong beside the test that caused them.
		app.echo = true;
		fakes.echo = true;
		await suite('Playwright end-to-end (Debian chromium)', async () => {
			const pwJson = path.join(reportDir, 'playwright.json');
			const ok = await processes.runVisible(
				processes.binPath('playwright'),
				['test', ...(process.env.TAPLINE_E2E_ARGS ?? '').split(' ').filter(Boolean)],
				{
					env: {
						...env,
						BASE_URL: env.ORIGIN,
						PLAYWRIGHT_JSON_OUTPUT_NAME: pwJson,
						TAPLINE_E2E_OUTPUT: path.join(reportDir, 'playwright')
					}
				}
			);
			if (!ok) failures.push('playwright');
			try {
				const r = JSON.parse(readFileSync(pwJson, 'utf8'));
				counts.passed += r.stats.expected + r.stats.flaky;
				counts.failed += r.stats.unexpected;
			} catch {
				failures.push('playwright report missing');
			}
		});
		await Promise.all([app, fakes].map((child) => processes.stopChild(child)));
	} else report.printWarnings();

	if (steps.has('start'))
		await suite('npm start: signals, ports and readiness', async () => {
			// The start script's tests run `node scripts/start.mjs` on ports of their own, with the
			// build made above.
			const ok = await vitest(['--project', 'scripts'], {
				TAPLINE_START_TEST_BUILD_DIR: buildEnv.TAPLINE_BUILD_DIR,
				TAPLINE_START_TEST_KIT_DIR: buildEnv.TAPLINE_KIT_DIR
			});
			if (!ok) failures.push('start script tests');
		});
}

try {
	await main();
} catch (err) {
	if (!(err instanceof processes.StopRequested)) {
		console.error(err);
		failures.push(String(err instanceof Error ? err.message.split('\n')[0] : err));
	}
} finally {
	await cleanUp();
}

const setup = report.timings.map((t) => `${t.label}: ${t.seconds.toFixed(1)} s`);
console.log(`\nTimings: ${[...setup, ...timings].join(' · ')}`);
console.log(`Set-up output: ${report.relLog}`);
if (failures.length) console.log(`Failed steps: ${failures.join(', ')}`);
console.log(`${counts.passed} passed, ${counts.failed} failed`);
process.exit(failures.length || counts.failed || counts.passed === 0 ? 1 : 0);

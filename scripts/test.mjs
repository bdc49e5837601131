// `npm test`: the same set-up as `npm start`, on throw-away databases, then every suite:
// svelte-check, lint, Vitest (unit + integration against PostgreSQL), build, Playwright end-to-end.
import { readFileSync, rmSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { ROOT, appEnv, loadConfig } from './lib/config.mjs';
import { ensureDebianPackages, ensureNodeModules, log } from './lib/system.mjs';

const timings = [];
const time = async (label, fn) => {
	const t0 = Date.now();
	try {
		return await fn();
	} finally {
		timings.push(`${label}: ${((Date.now() - t0) / 1000).toFixed(1)} s`);
	}
};

const config = loadConfig('test');
// TAPLINE_TEST_STEPS=check,vitest,e2e (default: all) runs a subset, e.g. `TAPLINE_TEST_STEPS=e2e npm test`.
const steps = new Set((process.env.TAPLINE_TEST_STEPS ?? 'check,vitest,e2e').split(','));
await time('install', () => {
	ensureNodeModules();
	ensureDebianPackages(['postgresql', 'chromium']);
});

const { ensureCluster } = await import('./lib/postgres.mjs');
const db = await import('./lib/database.mjs');
const { startChild, waitForPort, stopChildren, binPath } = await import('./lib/processes.mjs');
const { ensureBuild } = await import('./lib/build.mjs');

const run = (label, cmd, args, env = {}) => {
	log(label);
	const res = spawnSync(cmd, args, {
		stdio: 'inherit',
		cwd: ROOT,
		env: { ...process.env, ...env }
	});
	return res.status === 0;
};

const cluster = await time('postgres', () => ensureCluster(config));
const runId = `${Date.now().toString(36)}${process.pid}`;
const templateDb = `tapline_t${runId}_template`;
const e2eDb = `tapline_t${runId}_e2e`;
const failures = [];
const counts = { passed: 0, failed: 0 };
const shift = config.appPort - 3000;
const reportDir = path.join(ROOT, 'test-results', `run-${shift}`);
const buildEnv = {
	TAPLINE_BUILD_DIR: `build-test-${shift}`,
	TAPLINE_KIT_DIR: `.svelte-kit-test-${shift}`
};

async function cleanUp() {
	await stopChildren();
	for (const name of [e2eDb, templateDb])
		await db.dropDatabase(config.adminUrl, name).catch(() => {});
	// Integration databases of this run that a crashed worker left behind.
	cluster.stop();
}

rmSync(reportDir, { recursive: true, force: true });
try {
	await time('migrate', async () => {
		await db.ensureDatabase(config.adminUrl, templateDb);
		await db.migrateDatabase(config.dbUrl(templateDb));
	});
	const env = appEnv(config, config.dbUrl(e2eDb));

	if (steps.has('check'))
		await time('check', () => {
			run('svelte-kit sync', binPath('svelte-kit'), ['sync']);
			if (
				!run('svelte-check', binPath('svelte-check'), [
					'--tsconfig',
					'./tsconfig.json',
					'--fail-on-warnings'
				])
			)
				failures.push('svelte-check');
			if (!run('prettier --check', binPath('prettier'), ['--check', '.', '--log-level', 'warn']))
				failures.push('prettier');
			if (!run('eslint', binPath('eslint'), ['.'])) failures.push('eslint');
		});

	const vitestJson = path.join(reportDir, 'vitest.json');
	if (steps.has('vitest'))
		await time('vitest', () => {
			const ok = run(
				'Vitest: unit and integration',
				binPath('vitest'),
				['run', '--reporter=default', '--reporter=json', `--outputFile.json=${vitestJson}`],
				{
					TEST_ADMIN_DATABASE_URL: config.adminUrl,
					TEST_TEMPLATE_DATABASE: templateDb,
					TEST_DATABASE_URL_PREFIX: config.dbUrl(''),
					TAPLINE_WORKER: 'off'
				}
			);
			if (!ok) failures.push('vitest');
			try {
				const r = JSON.parse(readFileSync(vitestJson, 'utf8'));
				counts.passed += r.numPassedTests;
				counts.failed += r.numFailedTests;
			} catch {
				failures.push('vitest report missing');
			}
		});

	if (steps.has('e2e'))
		await time('build', () => ensureBuild({ ...env, ...buildEnv }, { force: true }));

	if (steps.has('e2e'))
		await time('e2e', async () => {
			await db.ensureDatabase(config.adminUrl, e2eDb, templateDb);
			db.seedDatabase(env.DATABASE_URL);
			const fakes = startChild('fakes', binPath('tsx'), ['local-fakes/index.ts'], env);
			await waitForPort(config.fakes.FAKE_SMTP_PORT, 30_000, fakes);
			await waitForPort(config.fakes.FAKE_MAIL_HTTP_PORT, 30_000, fakes);
			const app = startChild('app', process.execPath, [buildEnv.TAPLINE_BUILD_DIR], env);
			await waitForPort(config.appPort, 60_000, app);
			const pwJson = path.join(reportDir, 'playwright.json');
			const ok = run(
				'Playwright end-to-end (Debian chromium)',
				binPath('playwright'),
				['test', ...(process.env.TAPLINE_E2E_ARGS ?? '').split(' ').filter(Boolean)],
				{
					...env,
					BASE_URL: env.ORIGIN,
					PLAYWRIGHT_JSON_OUTPUT_NAME: pwJson,
					TAPLINE_E2E_OUTPUT: path.join(reportDir, 'playwright')
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
} catch (err) {
	console.error(err);
	failures.push(String(err instanceof Error ? err.message : err));
} finally {
	await cleanUp();
}

console.log(`\nTimings: ${timings.join(' · ')}`);
if (failures.length) console.log(`Failed steps: ${failures.join(', ')}`);
console.log(`${counts.passed} passed, ${counts.failed} failed`);
process.exit(failures.length || counts.failed || counts.passed === 0 ? 1 : 0);

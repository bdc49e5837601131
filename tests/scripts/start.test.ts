// `npm start` as a process manager sees it: started on ports of its own, stopped by a signal sent
// to its pid alone, refused when a port is taken. Run by `npm test` after the build (it reuses the
// test build through TAPLINE_BUILD_DIR); a cluster of its own lives in .data/pg-<port>.
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it } from 'vitest';
import { portIsFree, portOwner } from '../../scripts/lib/processes.mjs';
import { alive, descendants, freePorts, waitFor } from './process-tree';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const SHIFT = Number(process.env.TAPLINE_TEST_PORT_SHIFT ?? 1000);
// Clear of npm test's own cluster (54329 + shift) and of other shifts in steps of 1000.
const PG_PORT = 54329 + SHIFT + 50;
// npm test hands over its build (and the kit folder it was made with), so start reuses it.
const BUILD = {
	TAPLINE_BUILD_DIR: process.env.TAPLINE_START_TEST_BUILD_DIR,
	TAPLINE_KIT_DIR: process.env.TAPLINE_START_TEST_KIT_DIR
};
const FAKE_AUTH =
	'AWS4-HMAC-SHA256 Credential=local/20260301/ap-southeast-2/s3/aws4_request, SignedHeaders=host, Signature=' +
	'0'.repeat(64);

interface Started {
	child: ChildProcess;
	output: () => string;
	/** The exit code, or the signal that ended it. */
	exited: Promise<number | string | null>;
}

const started: Started[] = [];
/** Every process seen below a started npm start, for the clean-up after a failed test. */
const seen = new Set<number>();

async function startEnv() {
	const [app = 0, smtp = 0, mail = 0, s3 = 0, geocode = 0, tiles = 0, payments = 0] =
		await freePorts(7);
	const env: NodeJS.ProcessEnv = {
		...process.env,
		PORT: String(app),
		FAKE_SMTP_PORT: String(smtp),
		FAKE_MAIL_HTTP_PORT: String(mail),
		FAKE_S3_PORT: String(s3),
		FAKE_GEOCODE_PORT: String(geocode),
		FAKE_TILES_PORT: String(tiles),
		FAKE_STRIPE_PORT: String(payments),
		TAPLINE_PG_PORT: String(PG_PORT),
		...BUILD
	};
	// npm start's own settings only: no database or data folder handed down from outside.
	for (const name of ['DATABASE_URL', 'FAKES_DATA_DIR', 'TAPLINE_PG_DATA', 'npm_lifecycle_event'])
		delete env[name];
	return {
		env,
		ports: { app, fakes: [smtp, mail, s3, geocode, tiles, payments], pg: PG_PORT }
	};
}

function launch(env: NodeJS.ProcessEnv, viaNpm = false): Started {
	const child = viaNpm
		? spawn('npm', ['start', '--silent'], { cwd: ROOT, env, stdio: ['ignore', 'pipe', 'pipe'] })
		: spawn(process.execPath, ['scripts/start.mjs'], {
				cwd: ROOT,
				env,
				stdio: ['ignore', 'pipe', 'pipe']
			});
	let text = '';
	child.stdout?.on('data', (c: Buffer) => (text += c.toString()));
	child.stderr?.on('data', (c: Buffer) => (text += c.toString()));
	const exited = new Promise<number | string | null>((resolve) =>
		child.once('exit', (code, signal) => resolve(code ?? signal))
	);
	const run = { child, output: () => text, exited };
	started.push(run);
	return run;
}

async function waitForReady(run: Started): Promise<void> {
	await waitFor(
		() => /Tapline is running/.test(run.output()) || run.child.exitCode !== null,
		'npm start to be ready',
		150_000
	);
	if (run.child.exitCode !== null) throw new Error(`npm start failed:\n${run.output()}`);
}

/** Who listens on each port, checked to be a process that `npm start` started. */
function listeners(root: number, ports: number[]): number[] {
	const tree = new Set(descendants(root));
	return ports.map((port) => {
		const owner = portOwner(port) as { pid: number } | null;
		expect(owner, `something listens on port ${port}`).not.toBeNull();
		expect(tree.has(owner?.pid ?? 0), `port ${port} belongs to npm start's tree`).toBe(true);
		return owner?.pid ?? 0;
	});
}

afterEach(async () => {
	// A failed test must not leave a Tapline running: stop whatever is left, PostgreSQL included.
	for (const run of started.splice(0)) {
		if (run.child.exitCode === null && run.child.signalCode === null) {
			for (const pid of descendants(run.child.pid ?? 0)) seen.add(pid);
			run.child.kill('SIGTERM');
			await Promise.race([run.exited, new Promise((r) => setTimeout(r, 20_000))]);
		}
	}
	for (const pid of seen) if (alive(pid)) process.kill(pid, 'SIGKILL');
	seen.clear();
	const pg = portOwner(PG_PORT) as { pid: number; command: string } | null;
	if (pg && pg.command.includes(`pg-${PG_PORT}`)) process.kill(pg.pid, 'SIGINT');
});

describe('npm start stops everything it started', () => {
	it.each([
		['SIGTERM', 'npm start', true],
		['SIGINT', 'npm start', true],
		['SIGHUP', 'npm start', true],
		['SIGHUP', 'node scripts/start.mjs', false]
	] as const)(
		'%s to the %s process alone stops the app, the fakes and PostgreSQL',
		async (signal, _to, viaNpm) => {
			const { env, ports } = await startEnv();
			const run = launch(env, viaNpm);
			await waitForReady(run);
			const startPid = run.child.pid ?? 0;
			const appAndFakes = listeners(startPid, [ports.app, ...ports.fakes]);
			for (const pid of descendants(startPid)) seen.add(pid);
			const script = viaNpm
				? [...seen].find((pid) =>
						readFileSync(`/proc/${pid}/cmdline`, 'utf8').includes('scripts/start.mjs')
					)
				: startPid;
			expect(script).toBeDefined();
			const postgres = portOwner(ports.pg) as { pid: number; command: string } | null;
			expect(postgres?.command).toContain(`pg-${PG_PORT}`);
			expect(await (await fetch(`http://127.0.0.1:${ports.app}/`)).text()).toContain('Tapline');

			// Uploads go to a folder beside the database, so they outlive this run.
			const put = await fetch(`http://127.0.0.1:${ports.fakes[2]}/start-test/kept.txt`, {
				method: 'PUT',
				headers: { authorization: FAKE_AUTH },
				body: `kept by ${signal}`
			});
			expect(put.status).toBe(200);

			// The signal goes to one pid, as a process manager sends it. npm passes SIGINT and SIGTERM
			// on to the script; SIGHUP it does not pass on, and dies of it.
			process.kill(startPid, signal);
			expect(await run.exited).toBe(viaNpm && signal === 'SIGHUP' ? 'SIGHUP' : 0);
			await waitFor(
				() => [script ?? 0, ...appAndFakes, postgres?.pid ?? 0].every((pid) => !alive(pid)),
				'the start script, the app, the fakes and PostgreSQL to exit',
				20_000
			);
			for (const port of [ports.app, ...ports.fakes, ports.pg])
				expect(await portIsFree(port), `port ${port} is free again`).toBe(true);
			expect(descendants(startPid)).toEqual([]);
			expect(run.output()).toMatch(
				new RegExp(`${signal === 'SIGHUP' && viaNpm ? 'npm' : signal}.*stopping`)
			);

			// Beside the cluster: in .data, or in the folder the scripts fall back to when the postgres
			// user cannot reach the checkout (a clone in a private temporary folder).
			const dataDir = new RegExp(`(\\S*pg-${PG_PORT})`).exec(postgres?.command ?? '')?.[1];
			const base = dataDir ? path.dirname(dataDir) : path.join(ROOT, '.data');
			const s3Dir = path.join(base, `fakes-${PG_PORT}`, 's3', 'start-test');
			expect(existsSync(s3Dir) && readdirSync(s3Dir).some((f) => f.endsWith('.bin'))).toBe(true);
		}
	);
});

describe('npm start refuses a taken port before starting anything', () => {
	async function occupy(port: number): Promise<net.Server> {
		return new Promise((resolve) => {
			const server = net.createServer();
			server.listen(port, '127.0.0.1', () => resolve(server));
		});
	}

	it.each([
		['app', 'the app; set PORT to move it'],
		['PostgreSQL', 'PostgreSQL; set TAPLINE_PG_PORT to move it']
	] as const)(
		'names the %s port and who holds it, exits non-zero, and starts nothing else',
		async (name, description) => {
			const which = name === 'app' ? 'app' : 'pg';
			const { env, ports } = await startEnv();
			const all = [ports.app, ...ports.fakes, ports.pg];
			const blocker = await occupy(ports[which]);
			try {
				const run = launch(env);
				expect(await run.exited).toBe(1);
				expect(run.output()).toContain(
					`port ${ports[which]} (${description}) is in use by pid ${process.pid}`
				);
				for (const port of all.filter((p) => p !== ports[which]))
					expect(await portIsFree(port)).toBe(true);
			} finally {
				await new Promise((r) => blocker.close(r));
			}
		}
	);
});

// `npm start` on a clone that has never been built, as a newcomer runs it: `git clone` of the
// committed HEAD into a temporary folder (no .svelte-kit, no build, no .data), then `npm start`
// alone on ports of its own until it says it is running; the landing page and a signed-in page
// answer; Ctrl-C (SIGINT to the whole process group, as a terminal sends it) stops everything.
// The installed node_modules are hard-linked in (cp -al) rather than installed again: the clone's
// install step is what `npm ci` would have made, and the registry is not the subject here.
// Not covered: `npm ci` itself, installing Debian packages, a machine without a PostgreSQL.
import { execFileSync, spawn } from 'node:child_process';
import { copyFileSync, existsSync, mkdtempSync, rmSync, unlinkSync } from 'node:fs';
import { createHash } from 'node:crypto';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, expect, it } from 'vitest';
import { portIsFree, portOwner } from '../../scripts/lib/processes.mjs';
import { DEMO_TOUR, DEMO_TOUR_PASSWORD } from '../../src/lib/demo-tour.js';
import { alive, descendants, freePorts, waitFor } from './process-tree';

const ROOT = fileURLToPath(new URL('../..', import.meta.url));
const SHIFT = Number(process.env.TAPLINE_TEST_PORT_SHIFT ?? 1000);
// Clear of npm test's cluster (54329 + shift), start.test.ts's (+ 50) and other shifts.
const PG_PORT = 54329 + SHIFT + 60;
// What a shell in a fresh terminal has; nothing of the test run's own settings (NODE_ENV=test,
// DATABASE_URL, build folders) leaks into the clone's start.
const SHELL_VARIABLES = ['PATH', 'HOME', 'USER', 'LOGNAME', 'LANG', 'TERM', 'TMPDIR', 'SHELL'];

const clone = mkdtempSync(path.join(os.tmpdir(), 'tapline-fresh-clone-'));
const seen = new Set<number>();

afterAll(async () => {
	for (const pid of seen) if (alive(pid)) process.kill(pid, 'SIGKILL');
	const pg = portOwner(PG_PORT) as { pid: number; command: string } | null;
	if (pg && pg.command.includes(`pg-${PG_PORT}`)) {
		process.kill(pg.pid, 'SIGINT');
		await waitFor(() => !alive(pg.pid), 'the clone’s PostgreSQL to stop', 20_000);
	}
	rmSync(clone, { recursive: true, force: true });
	// Where the scripts keep the cluster when the postgres user cannot reach a private folder.
	const hash = createHash('sha1').update(clone).digest('hex').slice(0, 10);
	rmSync(path.join(os.tmpdir(), `tapline-pg-${hash}`), { recursive: true, force: true });
});

it('a fresh clone of HEAD starts with `npm start` alone, serves a signed-in page, and Ctrl-C stops all of it', async () => {
	const head = execFileSync('git', ['rev-parse', 'HEAD'], { cwd: ROOT, encoding: 'utf8' }).trim();
	execFileSync('git', ['clone', '--quiet', '--no-checkout', ROOT, clone]);
	execFileSync('git', ['-C', clone, 'checkout', '--quiet', '--detach', head]);
	for (const generated of ['.svelte-kit', 'build', '.data'])
		expect(existsSync(path.join(clone, generated)), `${generated} is not in a clone`).toBe(false);
	// Linked, not copied, to stay quick; Vite's cache is left out, since it is rewritten in place.
	execFileSync('cp', ['-al', path.join(ROOT, 'node_modules'), path.join(clone, 'node_modules')]);
	rmSync(path.join(clone, 'node_modules', '.vite'), { recursive: true, force: true });
	// npm's install marker, copied (not linked) so it is newer than the freshly checked-out lockfile
	// and the start does not reinstall.
	const marker = path.join(clone, 'node_modules', '.package-lock.json');
	unlinkSync(marker);
	copyFileSync(path.join(ROOT, 'node_modules', '.package-lock.json'), marker);

	const [app = 0, ...fakes] = await freePorts(7);
	const env: NodeJS.ProcessEnv = Object.fromEntries(
		SHELL_VARIABLES.filter((name) => process.env[name]).map((name) => [name, process.env[name]])
	);
	Object.assign(env, {
		PORT: String(app),
		TAPLINE_PG_PORT: String(PG_PORT),
		...Object.fromEntries(
			[
				'FAKE_SMTP_PORT',
				'FAKE_MAIL_HTTP_PORT',
				'FAKE_S3_PORT',
				'FAKE_GEOCODE_PORT',
				'FAKE_TILES_PORT',
				'FAKE_STRIPE_PORT'
			].map((name, i) => [name, String(fakes[i])])
		)
	});
	// Its own process group, as a terminal gives a command it runs.
	const child = spawn('npm', ['start'], {
		cwd: clone,
		env,
		detached: true,
		stdio: ['ignore', 'pipe', 'pipe']
	});
	let output = '';
	child.stdout.on('data', (c: Buffer) => (output += c.toString()));
	child.stderr.on('data', (c: Buffer) => (output += c.toString()));
	const exited = new Promise<number | string | null>((resolve) =>
		child.once('exit', (code, signal) => resolve(code ?? signal))
	);
	const npmPid = child.pid ?? 0;
	const track = () => descendants(npmPid).forEach((pid) => seen.add(pid));
	const tracker = setInterval(track, 1000);
	try {
		await waitFor(
			() => /Tapline is running/.test(output) || child.exitCode !== null,
			'npm start to report that Tapline is running',
			280_000
		);
		expect(output, 'npm start reached "is running"').toMatch(/Tapline is running/);
	} finally {
		clearInterval(tracker);
	}
	track();

	const origin = `http://127.0.0.1:${app}`;
	const landing = await fetch(`${origin}/`);
	expect(landing.status).toBe(200);
	const landingText = await landing.text();
	expect(landingText).toContain('Tapline');

	// The first screen says what to try, in the terminal and on the landing page, and every page it
	// names opens for its demo account, signed in as the sign-in form posts it without JavaScript.
	expect(landingText).toContain('Try the demo');
	for (const account of DEMO_TOUR) {
		expect(output).toContain(account.email);
		const signIn = await fetch(`${origin}/sign-in`, {
			method: 'POST',
			redirect: 'manual',
			headers: {
				'content-type': 'application/x-www-form-urlencoded',
				accept: 'text/html',
				origin
			},
			body: new URLSearchParams({ email: account.email, password: DEMO_TOUR_PASSWORD })
		});
		expect(signIn.status, account.email).toBe(303);
		expect(signIn.headers.get('location')).toBe(`/${account.role}`);
		const cookie = signIn.headers
			.getSetCookie()
			.map((c) => c.split(';')[0])
			.join('; ');
		for (const stop of account.stops) {
			expect(output).toContain(`${origin}${stop.path}`);
			expect(landingText).toContain(`href="${stop.path}"`);
			const page = await fetch(`${origin}${stop.path}`, {
				headers: { cookie },
				redirect: 'manual'
			});
			expect(page.status, `${account.email} ${stop.path}`).toBe(200);
		}
	}

	const postgres = portOwner(PG_PORT) as { pid: number; command: string } | null;
	expect(postgres?.command).toContain(`pg-${PG_PORT}`);

	// Ctrl-C: SIGINT to every process in the terminal's group at once.
	process.kill(-npmPid, 'SIGINT');
	const code = await exited;
	expect(output).toMatch(/SIGINT: stopping/);
	expect(output).toContain('Stopped.');
	await waitFor(
		() => [...seen, postgres?.pid ?? 0].every((pid) => !alive(pid)),
		'npm start, the app, the fakes and PostgreSQL to exit',
		30_000
	);
	expect([0, 'SIGINT'], `npm start ended by Ctrl-C (${String(code)})`).toContain(code);
	for (const port of [app, ...fakes, PG_PORT])
		expect(await portIsFree(port), `port ${port} is free again`).toBe(true);
	expect(descendants(npmPid)).toEqual([]);
}, 320_000);

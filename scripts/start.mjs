// `npm start`: install what is missing, start PostgreSQL, migrate, seed, start the local fakes,
// build and serve the app. One line per step; installs, the build and start-up output go to
// .data/logs/start.log. SIGINT, SIGTERM or SIGHUP (or the parent npm going away) stops everything
// it started; the data stays for next time.
import path from 'node:path';
import { DEMO_TOUR, DEMO_TOUR_PASSWORD } from '../src/lib/demo-tour.js';
import { ROOT, appEnv, loadConfig } from './lib/config.mjs';
import * as processes from './lib/processes.mjs';
import { bold, createReport } from './lib/report.mjs';
import { ensureDebianPackages, ensureNodeModules } from './lib/system.mjs';

const started = Date.now();
const config = loadConfig('start');
const report = createReport('npm start', path.join(ROOT, '.data', 'logs', 'start.log'));
const say = (text) => report.log(text);

let cluster = { stop: () => {}, startedHere: false };
let stopping = false;

/** Stops the app, the fakes, a step's command and PostgreSQL (if started here), then exits. */
async function shutdown(reason, code = 0) {
	if (stopping) return;
	stopping = true;
	if (reason)
		console.log(
			`\n${reason}: stopping the app, the fakes${cluster.startedHere ? ' and PostgreSQL' : ''}…`
		);
	await processes.stopChildren();
	cluster.stop();
	if (reason) console.log('Stopped.');
	process.exit(code);
}

// A process manager signals this process alone, not its group; the children have groups of their
// own, so every way of asking to stop goes through shutdown(). npm passes SIGINT and SIGTERM on
// but not SIGHUP, and dies of it: under npm, a changed parent id means npm is gone, so stop too.
for (const signal of ['SIGINT', 'SIGTERM', 'SIGHUP'])
	process.on(signal, () => void shutdown(signal));
// A closed terminal makes writes fail; that must not cut the shutdown short.
for (const stream of [process.stdout, process.stderr]) stream.on('error', () => {});
if (process.env.npm_lifecycle_event) {
	const parent = process.ppid;
	setInterval(() => {
		if (process.ppid !== parent) void shutdown('npm, which started this, went away');
	}, 500).unref();
}

/** Refuses to go on when any of the ports is taken, naming who holds it where /proc tells. */
async function requireFreePorts(ports) {
	const taken = [];
	for (const p of ports) if (!(await processes.portIsFree(p.port))) taken.push(p);
	if (taken.length === 0) return;
	const lines = taken.map((p) => {
		const owner = processes.portOwner(p.port);
		const who = owner ? ` by pid ${owner.pid} (${owner.command.slice(0, 80)})` : '';
		return `  port ${p.port} (${p.label}; set ${p.variable} to move it) is in use${who}`;
	});
	throw Object.assign(
		new Error(
			`Tapline cannot start: a port it needs is taken.\n${lines.join('\n')}\n` +
				'Is Tapline (or another copy of it) already running? Stop it first, or choose free ports.'
		),
		{ clear: true }
	);
}

const servicePorts = [
	{ label: 'the app', variable: 'PORT', port: config.appPort },
	{ label: 'mail fake, SMTP', variable: 'FAKE_SMTP_PORT', port: config.fakes.FAKE_SMTP_PORT },
	{
		label: 'mail fake, inbox',
		variable: 'FAKE_MAIL_HTTP_PORT',
		port: config.fakes.FAKE_MAIL_HTTP_PORT
	},
	{ label: 'S3 fake', variable: 'FAKE_S3_PORT', port: config.fakes.FAKE_S3_PORT },
	{ label: 'geocoder fake', variable: 'FAKE_GEOCODE_PORT', port: config.fakes.FAKE_GEOCODE_PORT },
	{ label: 'map tile fake', variable: 'FAKE_TILES_PORT', port: config.fakes.FAKE_TILES_PORT },
	{ label: 'payments fake', variable: 'FAKE_STRIPE_PORT', port: config.fakes.FAKE_STRIPE_PORT }
];

async function main() {
	console.log(
		`${bold('Tapline')} · npm start   (installs, build and start-up output: ${report.relLog})`
	);
	await report.step('ports free', () => requireFreePorts(servicePorts));
	await report.step('npm packages', (step) => ensureNodeModules(report.run).then(step.note));
	// PostgreSQL and PostGIS unless a database is given; DejaVu and fontconfig's settings for the
	// map tiles' labels.
	const debian = [
		'postgresql',
		'postgresql-15-postgis-3',
		'fonts-dejavu-core',
		'fontconfig-config'
	].filter((name) => !name.startsWith('postgresql') || !config.externalDatabaseUrl);
	await report.step('Debian packages', (step) =>
		ensureDebianPackages(debian, report.run).then(step.note)
	);

	// Loaded now: they use packages that npm ci has just installed.
	const { prepareCluster, startCluster } = await import('./lib/postgres.mjs');
	const { ensureDatabase, hasDemoAccounts, migrateDatabase, seedDatabase } =
		await import('./lib/database.mjs');
	const { ensureBuild } = await import('./lib/build.mjs');

	let databaseUrl = config.externalDatabaseUrl;
	let dataBase = path.join(ROOT, '.data');
	if (!databaseUrl) {
		await report.step('PostgreSQL', async (step) => {
			const prepared = prepareCluster(config, { say });
			if (!prepared.running) {
				await requireFreePorts([
					{ label: 'PostgreSQL', variable: 'TAPLINE_PG_PORT', port: config.pgPort }
				]);
			}
			if (stopping) throw new processes.StopRequested();
			cluster = startCluster(prepared, { say });
			dataBase = cluster.base;
			step.note(
				`${cluster.startedHere ? 'started' : 'already running (left running on exit)'} on 127.0.0.1:${config.pgPort}, data in ${path.relative(ROOT, cluster.dataDir) || cluster.dataDir}`
			);
			await ensureDatabase(config.adminUrl, 'tapline');
		});
		databaseUrl = config.dbUrl('tapline');
	}
	await report.step('migrations', () => migrateDatabase(databaseUrl));

	// The fakes keep uploads and mail beside the database, so they survive a restart together.
	const fakesData = process.env.FAKES_DATA_DIR || path.join(dataBase, `fakes-${config.pgPort}`);
	const env = { ...appEnv(config, databaseUrl), FAKES_DATA_DIR: fakesData };
	const fakes = await report.step('local fakes', async (step) => {
		const child = processes.startChild(
			'fakes',
			processes.binPath('tsx'),
			['local-fakes/index.ts'],
			env,
			{
				logFile: report.logFile
			}
		);
		await processes.waitForChildPorts(child, Object.values(config.fakes), 30_000);
		step.note(`uploads, mail and payments kept in ${path.relative(ROOT, fakesData) || fakesData}`);
		return child;
	});
	// After the fakes: the seed stores the demo installers' documents in the object store.
	await report.step('demo data', (step) =>
		seedDatabase(databaseUrl, report.run, env).then(step.note)
	);

	const buildDir = process.env.TAPLINE_BUILD_DIR || 'build';
	await report.step('build', (step) =>
		ensureBuild({ ...env, TAPLINE_BUILD_DIR: buildDir }, { run: report.run }).then(step.note)
	);
	const app = await report.step('app', async () => {
		const child = processes.startChild('app', process.execPath, [buildDir], env, {
			logFile: report.logFile
		});
		await processes.waitForChildPorts(child, [config.appPort], 60_000);
		return child;
	});
	for (const child of [app, fakes]) {
		report.scan(child.recent.join('\n'));
		child.on('exit', (code, signal) => {
			if (!stopping) {
				console.error(`${child === app ? 'The app' : 'The fakes'} stopped (${code ?? signal}).`);
				void shutdown('A service stopped', 1);
			}
		});
	}
	report.printWarnings();

	const seconds = ((Date.now() - started) / 1000).toFixed(0);
	const tour = (await hasDemoAccounts(databaseUrl, DEMO_TOUR)) ? demoTourLines(env.ORIGIN) : '';
	console.log(`
${bold('Tapline is running')} at ${env.ORIGIN}   (ready in ${seconds} s; Ctrl-C stops it)
${tour}
  Mail sent by the app: ${env.FAKE_MAIL_API}/
  Log of installs, build and start-up: ${report.relLog}
  From here on the app's and the fakes' output shows below.
`);
	// Their output so far is in the log; from now on it also shows here.
	app.echo = true;
	fakes.echo = true;
}

/** What to try first, per demo account: three pages each (src/lib/demo-tour.js). */
function demoTourLines(origin) {
	const accounts = DEMO_TOUR.map(
		(a) =>
			`\n  ${bold(`${a.role}`)}  ${a.email}\n` +
			a.stops.map((s) => `    ${s.label}\n      ${origin}${s.path}`).join('\n')
	);
	return `\n  Try the demo (password for every account: ${DEMO_TOUR_PASSWORD})${accounts.join('\n')}\n`;
}

main().catch(async (err) => {
	if (err instanceof processes.StopRequested || stopping) return;
	console.error(`\n${err?.clear ? err.message : `npm start failed: ${err?.message ?? err}`}`);
	if (!err?.clear) console.error(`Details: ${report.relLog}`);
	await shutdown(null, 1);
});

// `npm start`: install what is missing, start PostgreSQL, migrate, seed, start the local fakes,
// build and serve the app. Ctrl-C stops everything it started; the data stays for next time.
import { loadConfig, appEnv } from './lib/config.mjs';
import { ensureDebianPackages, ensureNodeModules, log } from './lib/system.mjs';

const started = Date.now();
const config = loadConfig('start');
ensureNodeModules();
if (!config.externalDatabaseUrl) ensureDebianPackages(['postgresql']);

const { ensureCluster } = await import('./lib/postgres.mjs');
const { ensureDatabase, migrateDatabase, seedDatabase } = await import('./lib/database.mjs');
const { startChild, waitForPort, stopChildren, binPath } = await import('./lib/processes.mjs');
const { ensureBuild } = await import('./lib/build.mjs');

let cluster = { stop: () => {} };
let databaseUrl = config.externalDatabaseUrl;
if (!databaseUrl) {
	cluster = ensureCluster(config);
	await ensureDatabase(config.adminUrl, 'tapline');
	databaseUrl = config.dbUrl('tapline');
}
log('Applying migrations…');
await migrateDatabase(databaseUrl);
seedDatabase(databaseUrl);

const env = appEnv(config, databaseUrl);
let stopping = false;
async function shutdown(code = 0) {
	if (stopping) return;
	stopping = true;
	log('Stopping…');
	await stopChildren();
	cluster.stop();
	process.exit(code);
}
process.on('SIGINT', () => void shutdown(0));
process.on('SIGTERM', () => void shutdown(0));

try {
	const fakes = startChild('fakes', binPath('tsx'), ['local-fakes/index.ts'], env);
	await waitForPort(config.fakes.FAKE_SMTP_PORT, 30_000, fakes);
	ensureBuild(env);
	const app = startChild('app', process.execPath, ['build'], env);
	app.on('exit', (code) => {
		if (!stopping) {
			console.error(`The app stopped (exit ${code}).`);
			void shutdown(1);
		}
	});
	await waitForPort(config.appPort, 60_000, app);
} catch (err) {
	console.error(err);
	await shutdown(1);
}

const seconds = ((Date.now() - started) / 1000).toFixed(0);
console.log(`
\x1b[1mTapline is running\x1b[0m at ${env.ORIGIN}   (ready in ${seconds} s; Ctrl-C stops it)

  Demo sign-ins (password for all: tapline-demo-2026)
    owner       demo.owner@tapline.test
    installer   demo.installer@tapline.test
    admin       demo.admin@tapline.test

  Mail sent by the app: ${env.FAKE_MAIL_API}/
`);

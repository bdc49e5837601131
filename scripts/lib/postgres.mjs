// @ts-nocheck -- plain-JS orchestration that runs before npm ci; type-checked by its own use, not by tsc
// A private PostgreSQL cluster for this checkout: its own data folder, its own port on 127.0.0.1.
// initdb and pg_ctl refuse to run as root, so as root they run as the `postgres` user, on a folder
// that user owns (inside the checkout when it can reach it, else in the system temp folder).
import { execFileSync, spawnSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { chmodSync, chownSync, existsSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { ROOT } from './config.mjs';
import { findPostgresBin, isRoot, log, userCanWrite } from './system.mjs';

const PG_USER = 'postgres';

function ids(user) {
	return {
		uid: Number(execFileSync('id', ['-u', user]).toString().trim()),
		gid: Number(execFileSync('id', ['-g', user]).toString().trim())
	};
}

/** Runs a PostgreSQL server program as the right user. */
function pgRun(bin, program, args, { check = true } = {}) {
	const exe = path.join(bin, program);
	const res = isRoot()
		? spawnSync('runuser', ['-u', PG_USER, '--', exe, ...args], {
				encoding: 'utf8',
				cwd: os.tmpdir()
			})
		: spawnSync(exe, args, { encoding: 'utf8' });
	if (check && res.status !== 0) {
		throw new Error(`${program} failed (${res.status}):\n${res.stdout}\n${res.stderr}`);
	}
	return res;
}

/** Picks (and prepares) the folder that holds the cluster. */
function clusterBase(config) {
	if (config.pgDataDir) return config.pgDataDir;
	const inTree = path.join(ROOT, '.data');
	mkdirSync(inTree, { recursive: true });
	if (!isRoot()) return inTree;
	const { uid, gid } = ids(PG_USER);
	try {
		chownSync(inTree, uid, gid);
	} catch {
		/* fall through to the reachability check */
	}
	if (userCanWrite(PG_USER, inTree)) return inTree;
	const hash = createHash('sha1').update(ROOT).digest('hex').slice(0, 10);
	const fallback = path.join(os.tmpdir(), `tapline-pg-${hash}`);
	log(`The postgres user cannot reach ${inTree}; keeping the cluster in ${fallback}`);
	mkdirSync(fallback, { recursive: true });
	chownSync(fallback, uid, gid);
	chmodSync(fallback, 0o700);
	return fallback;
}

/**
 * Creates the cluster's folder and data (initdb) if needed, without starting it. Returns what
 * startCluster() needs, plus `base` (the folder holding it) and `running` (already started,
 * by an earlier run or someone else). `say` reports progress (default: the console).
 */
export function prepareCluster(config, { say = log } = {}) {
	const bin = findPostgresBin();
	if (!bin) throw new Error('PostgreSQL is not installed');
	const base = clusterBase(config);
	const dataDir = path.join(base, `pg-${config.pgPort}`);
	const logFile = path.join(base, `postgres-${config.pgPort}.log`);
	let created = false;

	if (!existsSync(path.join(dataDir, 'PG_VERSION'))) {
		say(`Creating a PostgreSQL cluster in ${dataDir}…`);
		created = true;
		const pwfile = path.join(os.tmpdir(), `tapline-pw-${process.pid}`);
		writeFileSync(pwfile, `${config.pgPassword}\n`, { mode: 0o644 });
		try {
			pgRun(bin, 'initdb', [
				'-D',
				dataDir,
				'-U',
				config.pgUser,
				`--pwfile=${pwfile}`,
				'--auth=scram-sha-256',
				'-E',
				'UTF8',
				'--no-locale'
			]);
		} finally {
			rmSync(pwfile, { force: true });
		}
		// Loopback only, no Unix socket (its default folder may not be writable), and commits that
		// do not wait for the disk: this cluster holds a local demo and throw-away test databases.
		const conf = [
			`listen_addresses = '127.0.0.1'`,
			`unix_socket_directories = ''`,
			`synchronous_commit = off`,
			`max_connections = 200`
		].join('\n');
		const confPath = path.join(dataDir, 'postgresql.auto.conf');
		writeFileSync(confPath, `${conf}\n`, { flag: 'a' });
		if (isRoot()) {
			const { uid, gid } = ids(PG_USER);
			chownSync(confPath, uid, gid);
		}
	}
	const status = pgRun(bin, 'pg_ctl', ['status', '-D', dataDir], { check: false });
	return {
		bin,
		base,
		dataDir,
		logFile,
		port: config.pgPort,
		created,
		running: status.status === 0
	};
}

/**
 * Starts a prepared cluster unless it runs already. Returns `{ dataDir, base, startedHere, stop }`;
 * `stop` is a no-op when the cluster was already running (someone else owns it).
 */
export function startCluster(prepared, { say = log } = {}) {
	const { bin, base, dataDir, logFile, port } = prepared;
	if (prepared.running) {
		say(`PostgreSQL already running on 127.0.0.1:${port}`);
		return { dataDir, base, startedHere: false, stop: () => {} };
	}
	say(`Starting PostgreSQL on 127.0.0.1:${port}…`);
	pgRun(bin, 'pg_ctl', [
		'start',
		'-D',
		dataDir,
		'-l',
		logFile,
		'-w',
		'-t',
		'90',
		'-o',
		`-p ${port}`
	]);
	return {
		dataDir,
		base,
		startedHere: true,
		stop: () => {
			pgRun(bin, 'pg_ctl', ['stop', '-D', dataDir, '-m', 'fast', '-w'], { check: false });
		}
	};
}

/** Creates the cluster if needed and starts it (see prepareCluster and startCluster). */
export function ensureCluster(config, options = {}) {
	return startCluster(prepareCluster(config, options), options);
}

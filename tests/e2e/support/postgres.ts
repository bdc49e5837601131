/**
 * Stops and starts the test run's PostgreSQL cluster with pg_ctl, as scripts/lib/postgres.mjs
 * does: as the `postgres` user when running as root (initdb and pg_ctl refuse root), with the
 * same port and log file. The cluster is found from DATABASE_URL (its data directory asked from
 * the server itself).
 */
import { spawnSync } from 'node:child_process';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';
import { findPostgresBin, isRoot } from '../../../scripts/lib/system.mjs';

export interface Cluster {
	dataDir: string;
	port: string;
	stop: () => void;
	start: () => void;
	isRunning: () => boolean;
}

function pgCtl(args: string[]) {
	const bin = findPostgresBin();
	if (!bin) throw new Error('PostgreSQL is not installed');
	const exe = path.join(bin, 'pg_ctl');
	return isRoot()
		? spawnSync('runuser', ['-u', 'postgres', '--', exe, ...args], {
				encoding: 'utf8',
				cwd: os.tmpdir()
			})
		: spawnSync(exe, args, { encoding: 'utf8' });
}

function check(res: ReturnType<typeof pgCtl>, what: string) {
	if (res.status !== 0)
		throw new Error(`pg_ctl ${what} failed (${res.status}):\n${res.stdout}\n${res.stderr}`);
}

/** The cluster that serves DATABASE_URL. */
export async function testCluster(): Promise<Cluster> {
	const url = process.env.DATABASE_URL;
	if (!url) throw new Error('DATABASE_URL is not set: run through `npm test`');
	const client = new pg.Client({ connectionString: url });
	await client.connect();
	const dataDir = (await client.query<{ data_directory: string }>('SHOW data_directory')).rows[0]!
		.data_directory;
	await client.end();
	const port = new URL(url).port;
	const logFile = path.join(path.dirname(dataDir), `postgres-${port}.log`);
	return {
		dataDir,
		port,
		stop: () => check(pgCtl(['stop', '-D', dataDir, '-m', 'fast', '-w']), 'stop'),
		start: () =>
			check(
				pgCtl(['start', '-D', dataDir, '-l', logFile, '-w', '-t', '90', '-o', `-p ${port}`]),
				'start'
			),
		isRunning: () => pgCtl(['status', '-D', dataDir]).status === 0
	};
}

// @ts-nocheck -- plain-JS orchestration that runs before npm ci; type-checked by its own use, not by tsc
// Installing what is missing: npm packages and Debian packages; running commands.
import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { ROOT } from './config.mjs';

export const log = (msg) => console.log(`\x1b[33m▸\x1b[0m ${msg}`);
export const isRoot = () => process.getuid?.() === 0;

/** Runs a command, streaming its output; throws on a non-zero exit. */
export function run(cmd, args, options = {}) {
	const res = spawnSync(cmd, args, { stdio: 'inherit', cwd: ROOT, ...options });
	if (res.status !== 0) {
		throw new Error(`${cmd} ${args.join(' ')} exited with ${res.status ?? res.signal}`);
	}
}

/**
 * `npm ci` when node_modules is missing or older than package-lock.json. `run(cmd, args)` runs
 * it (a report's run, so its output goes to the log). Returns what it did, in a word or two.
 */
export async function ensureNodeModules(run) {
	const marker = path.join(ROOT, 'node_modules', '.package-lock.json');
	const lock = path.join(ROOT, 'package-lock.json');
	if (existsSync(marker) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs) return 'up to date';
	await run('npm', ['ci', '--no-audit', '--no-fund']);
	return 'installed (npm ci)';
}

/** The bin folder of the newest PostgreSQL server Debian installed, or null. */
export function findPostgresBin() {
	const base = '/usr/lib/postgresql';
	if (!existsSync(base)) return null;
	const versions = readdirSync(base)
		.filter((v) => existsSync(path.join(base, v, 'bin', 'initdb')))
		.sort((a, b) => Number(b) - Number(a));
	return versions.length ? path.join(base, versions[0], 'bin') : null;
}

// Debian packages the scripts may install, each with how to tell it is there.
const APT = {
	postgresql: () => findPostgresBin() !== null,
	// PostGIS for the job board's geography columns (CREATE EXTENSION postgis in a migration).
	'postgresql-15-postgis-3': () => existsSync('/usr/share/postgresql/15/extension/postgis.control'),
	chromium: () => existsSync('/usr/bin/chromium'),
	// The tile fake's labels: sharp draws SVG text with fonts found through fontconfig.
	'fonts-dejavu-core': () => existsSync('/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf'),
	'fontconfig-config': () => existsSync('/etc/fonts/fonts.conf')
};

/**
 * Installs Debian packages that are missing, with apt-get (as root, or through password-less
 * sudo), through `run(cmd, args, options)`. Returns what it did, in a few words.
 */
export async function ensureDebianPackages(names, run) {
	const missing = names.filter((n) => !APT[n]());
	if (missing.length === 0) return 'present';
	let prefix = [];
	if (!isRoot()) {
		const sudo = spawnSync('sudo', ['-n', 'true']);
		if (sudo.status !== 0) {
			throw new Error(
				`Missing ${missing.join(', ')}. Install them with: sudo apt-get install -y ${missing.join(' ')}`
			);
		}
		prefix = ['sudo', '-n'];
	}
	const env = { DEBIAN_FRONTEND: 'noninteractive' };
	const apt = (args) =>
		prefix.length
			? run(prefix[0], [...prefix.slice(1), 'apt-get', ...args], { env })
			: run('apt-get', args, { env });
	await apt(['update', '-qq']);
	await apt(['install', '-y', '-qq', ...missing]);
	for (const n of missing) if (!APT[n]()) throw new Error(`apt-get did not install ${n}`);
	return `installed ${missing.join(', ')}`;
}

/** True when `user` can enter and write `dir`. */
export function userCanWrite(user, dir) {
	try {
		execFileSync('runuser', ['-u', user, '--', 'test', '-w', dir, '-a', '-x', dir], {
			stdio: 'ignore'
		});
		return true;
	} catch {
		return false;
	}
}

// @ts-nocheck -- plain-JS orchestration that runs before npm ci; type-checked by its own use, not by tsc
// Installing what is missing: npm packages and Debian packages.
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

/** `npm ci` when node_modules is missing or older than package-lock.json. */
export function ensureNodeModules() {
	const marker = path.join(ROOT, 'node_modules', '.package-lock.json');
	const lock = path.join(ROOT, 'package-lock.json');
	if (existsSync(marker) && statSync(marker).mtimeMs >= statSync(lock).mtimeMs) return;
	log('Installing npm packages (npm ci)…');
	run('npm', ['ci', '--no-audit', '--no-fund']);
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

const APT = {
	postgresql: () => findPostgresBin() !== null,
	chromium: () => existsSync('/usr/bin/chromium')
};

/** Installs Debian packages that are missing, with apt-get (as root, or through password-less sudo). */
export function ensureDebianPackages(names) {
	const missing = names.filter((n) => !APT[n]());
	if (missing.length === 0) return;
	log(`Installing Debian packages: ${missing.join(', ')} (apt-get)…`);
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
	const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' };
	const apt = (args) =>
		prefix.length
			? run(prefix[0], [...prefix.slice(1), 'apt-get', ...args], { env })
			: run('apt-get', args, { env });
	apt(['update', '-qq']);
	apt(['install', '-y', '-qq', ...missing]);
	for (const n of missing) if (!APT[n]()) throw new Error(`apt-get did not install ${n}`);
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

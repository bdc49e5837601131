// @ts-nocheck -- plain-JS orchestration that runs before npm ci; type-checked by its own use, not by tsc
// Builds the app with adapter-node when the build is missing or older than its sources.
import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { ROOT } from './config.mjs';
import { log, run } from './system.mjs';
import { binPath } from './processes.mjs';

function newestMtime(p) {
	if (!existsSync(p)) return 0;
	const st = statSync(p);
	if (!st.isDirectory()) return st.mtimeMs;
	return readdirSync(p).reduce(
		(max, entry) => Math.max(max, newestMtime(path.join(p, entry))),
		st.mtimeMs
	);
}

const SOURCES = [
	'src',
	'static',
	'svelte.config.js',
	'vite.config.ts',
	'tailwind.config.ts',
	'package-lock.json'
];

/** Runs `vite build` unless build/ is newer than every source. */
export function ensureBuild(env, { force = false } = {}) {
	const built = path.join(ROOT, env.TAPLINE_BUILD_DIR ?? 'build', 'handler.js');
	const sourceTime = Math.max(...SOURCES.map((s) => newestMtime(path.join(ROOT, s))));
	if (!force && existsSync(built) && statSync(built).mtimeMs > sourceTime) {
		log('Build is current.');
		return;
	}
	log('Building the app (vite build)…');
	run(binPath('vite'), ['build'], { env: { ...process.env, ...env } });
}

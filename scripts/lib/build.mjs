// @ts-nocheck -- plain-JS orchestration that runs before npm ci; type-checked by its own use, not by tsc
// Builds the app with adapter-node when the build is missing or older than its sources.
import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { ROOT } from './config.mjs';
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

/**
 * Runs `vite build` (through `run`, a report's run) unless the build folder is newer than every
 * source. Returns 'current' or 'built'.
 */
export async function ensureBuild(env, { force = false, run }) {
	const built = path.join(ROOT, env.TAPLINE_BUILD_DIR ?? 'build', 'handler.js');
	const sourceTime = Math.max(...SOURCES.map((s) => newestMtime(path.join(ROOT, s))));
	if (!force && existsSync(built) && statSync(built).mtimeMs > sourceTime) return 'current';
	// tsconfig.json extends .svelte-kit/tsconfig.json; a fresh clone has none until a sync, and a
	// build into another kit folder (TAPLINE_KIT_DIR) would not write it.
	if (!existsSync(path.join(ROOT, '.svelte-kit', 'tsconfig.json'))) {
		await run(binPath('svelte-kit'), ['sync'], { env: { TAPLINE_KIT_DIR: undefined } });
	}
	await run(binPath('vite'), ['build'], { env });
	return 'built';
}

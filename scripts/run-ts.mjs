// @ts-nocheck -- plain-JS orchestration; type-checked by its own use, not by tsc
// `node scripts/run-ts.mjs <module.ts>`: runs a TypeScript module of the project (the seed, the
// bench) the way the app's server code runs: through Vite with the SvelteKit plugin, so `$lib`,
// `$env/dynamic/private` and `$app/environment` resolve from svelte.config.js itself. Nothing here
// needs `.svelte-kit` or a build first, so it works on a clone that was never built. The module's
// top-level code runs on import; an exported `main()` is then awaited.
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { ROOT, appEnv, loadConfig } from './lib/config.mjs';

const [file] = process.argv.slice(2);
if (!file) {
	console.error('usage: node scripts/run-ts.mjs <module.ts>');
	process.exit(2);
}

// What `npm start` would set, for whatever the environment leaves unset: `npm run db:seed` then
// seeds the start's database with `npm run fakes` running beside it.
const config = loadConfig('start');
const defaults = appEnv(config, process.env.DATABASE_URL ?? config.dbUrl('tapline'));
for (const [name, value] of Object.entries(defaults)) process.env[name] ??= value;

// Loaded here, not at the top: the packages must be installed before this runs.
const { createServer } = await import('vite');
const { sveltekit } = await import('@sveltejs/kit/vite');

// The SvelteKit plugin reads svelte.config.js from the working folder.
process.chdir(ROOT);
const server = await createServer({
	configFile: false,
	root: ROOT,
	logLevel: 'warn',
	appType: 'custom',
	plugins: [sveltekit()],
	server: { middlewareMode: true, hmr: false, ws: false, watch: null },
	optimizeDeps: { noDiscovery: true, include: [] }
});
let code = 0;
try {
	const url = pathToFileURL(path.resolve(ROOT, file)).pathname;
	const mod = await server.ssrLoadModule(url);
	if (typeof mod.main === 'function') await mod.main();
} catch (err) {
	server.ssrFixStacktrace?.(err);
	console.error(err);
	code = 1;
} finally {
	await server.close();
}
// A pool or timer the module left open must not keep the process alive.
process.exit(code);

import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		// Test runs build into their own folders so parallel runs (different port shifts) never collide.
		adapter: adapter({ out: process.env.TAPLINE_BUILD_DIR ?? 'build' }),
		outDir: process.env.TAPLINE_KIT_DIR ?? '.svelte-kit',
		// Content-Security-Policy on every page SvelteKit renders. 'auto': a fresh nonce per
		// server-rendered page, hashes for prerendered ones, on SvelteKit's own inline scripts; no
		// other script runs. Style attributes stay allowed (style-src-attr): Svelte's style
		// directives and Leaflet's markers write them; style elements and sheets are our own.
		// hooks.server.ts adds the map tiles' origin (PUBLIC_TILE_URL, read at run time) to img-src.
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				'style-src': ['self'],
				'style-src-attr': ['unsafe-inline'],
				'img-src': ['self', 'data:', 'blob:'],
				'font-src': ['self'],
				'connect-src': ['self'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		},
		typescript: {
			// Type-check the fakes, the seed and the bench with the app's settings.
			config: (tsconfig) => {
				tsconfig.include.push(
					'../local-fakes/**/*.ts',
					'../seed/**/*.ts',
					'../bench/**/*.ts',
					'../playwright.config.ts',
					'../drizzle.config.ts',
					'../tailwind.config.ts'
				);
				return tsconfig;
			}
		}
	}
};

export default config;

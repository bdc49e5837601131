import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		// Test runs build into their own folders so parallel runs (different port shifts) never collide.
		adapter: adapter({ out: process.env.TAPLINE_BUILD_DIR ?? 'build' }),
		outDir: process.env.TAPLINE_KIT_DIR ?? '.svelte-kit',
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

import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		adapter: adapter({ out: 'build' }),
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

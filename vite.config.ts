import { sveltekit } from '@sveltejs/kit/vite';
import tailwindcss from '@tailwindcss/vite';
import path from 'node:path';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	test: {
		expect: { requireAssertions: true },
		projects: [
			{
				extends: true,
				test: {
					name: 'unit',
					environment: 'node',
					include: ['src/**/*.spec.ts', 'local-fakes/**/*.spec.ts', 'tests/unit/**/*.spec.ts']
				}
			},
			{
				extends: true,
				test: {
					name: 'integration',
					environment: 'node',
					include: ['tests/integration/**/*.test.ts'],
					alias: { '$env/dynamic/private': path.resolve('tests/integration/env.ts') },
					globalSetup: ['tests/integration/global-setup.ts'],
					setupFiles: ['tests/integration/setup.ts'],
					testTimeout: 30_000,
					hookTimeout: 60_000
				}
			},
			{
				// `npm start` itself, run as a process on ports of its own (npm test's last step).
				extends: true,
				test: {
					name: 'scripts',
					environment: 'node',
					include: ['tests/scripts/**/*.test.ts'],
					fileParallelism: false,
					testTimeout: 180_000,
					hookTimeout: 60_000
				}
			}
		]
	}
});

import { defineConfig, devices } from '@playwright/test';

// `npm test` starts the app, the fakes and a seeded database, then runs this with BASE_URL set.
const baseURL = process.env.BASE_URL ?? 'http://127.0.0.1:4000';

const chromium = {
	...devices['Desktop Chrome'],
	launchOptions: {
		executablePath: '/usr/bin/chromium',
		args: [
			'--no-sandbox',
			'--disable-gpu',
			'--disable-background-networking',
			'--disable-component-update',
			'--disable-sync',
			'--no-first-run',
			'--disable-quic'
		]
	}
};

export default defineConfig({
	testDir: 'tests/e2e',
	fullyParallel: false,
	workers: 1,
	retries: 0,
	timeout: 60_000,
	expect: { timeout: 15_000 },
	reporter: [['list'], ['json']],
	outputDir: process.env.TAPLINE_E2E_OUTPUT ?? 'test-results/playwright',
	use: { baseURL, trace: 'retain-on-failure', screenshot: 'only-on-failure' },
	projects: [
		{ name: 'chromium', use: chromium, testIgnore: /no-js\.spec\.ts/ },
		{
			name: 'no-javascript',
			use: { ...chromium, javaScriptEnabled: false },
			testMatch: /no-js\.spec\.ts/
		}
	]
});

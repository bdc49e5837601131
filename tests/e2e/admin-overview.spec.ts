import { DEMO, expect, signIn, test } from './fixtures';

test('the admin overview shows the market with a chart, a map and the same figures in text', async ({
	page
}) => {
	await signIn(page, DEMO.admin);
	await page.goto('/admin');
	const figures = page.getByTestId('market-figures');
	await expect(figures).toContainText('First quote within a day');
	await expect(figures).toContainText('Median time to first quote');
	// The money side, from the ledger (tests/integration/money-metrics.test.ts checks the sums).
	for (const label of ['Fee revenue', 'Paid out to installers', 'Refunds']) {
		await expect(figures).toContainText(label);
	}
	// The week table adds up to the headline count of jobs posted.
	await page.getByText('The figures, week by week').click();
	const rows = page.getByTestId('week-row');
	await expect(rows).toHaveCount(12);
	const perWeek = await rows.evaluateAll((trs) =>
		trs.map((tr) => Number(tr.querySelectorAll('td')[1]?.textContent ?? 'NaN'))
	);
	const total = perWeek.reduce((a, b) => a + b, 0);
	expect(total).toBeGreaterThan(0);
	const headline = figures.locator('div', { hasText: 'Jobs posted' }).locator('dd').first();
	await expect(headline).toHaveText(String(total));
	// The demo's jobs are around Adelaide; Walkerville is one of their suburbs.
	await expect(page.getByTestId('suburb-list')).toContainText('Walkerville');
	await expect(
		page.getByTestId('suburb-map').locator('.leaflet-interactive').first()
	).toBeVisible();
	// Chart.js has drawn on the canvas: some pixel is no longer transparent.
	const canvas = page.getByTestId('weekly-chart');
	await expect(canvas).toBeVisible();
	await expect
		.poll(() =>
			canvas.evaluate((c: HTMLCanvasElement) => {
				const ctx = c.getContext('2d');
				if (!ctx || c.width === 0) return false;
				const pixels = ctx.getImageData(0, 0, c.width, c.height).data;
				for (let i = 3; i < pixels.length; i += 4) if (pixels[i] !== 0) return true;
				return false;
			})
		)
		.toBe(true);
});

test('the admin navigation counts the applications waiting, and the queue says how long each has waited', async ({
	page
}) => {
	await signIn(page, DEMO.admin);
	await page.goto('/admin/vetting?status=applied');
	const summary = await page.getByText(/\d+ applications? · page/).textContent();
	const waiting = Number(/(\d+) application/.exec(summary ?? '')?.[1]);
	// The vetting link's count (the disputes link has its own when one is open).
	const count = page
		.getByRole('navigation', { name: 'Main', exact: true })
		.getByRole('link', { name: /^Vetting/ })
		.getByTestId('nav-count');
	if (waiting > 0) {
		await expect(count).toHaveText(String(waiting));
		await expect(page.getByTestId('waiting-for').first()).toHaveText(
			/^waiting \d+ (second|minute|hour|day|month|year)s?$/
		);
	} else {
		await expect(count).toHaveCount(0);
	}
});

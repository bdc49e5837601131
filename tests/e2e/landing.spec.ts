import { expect, test } from './fixtures';

test('the landing page explains the service to owners and to installers', async ({ page }) => {
	await page.goto('/');
	await expect(page).toHaveTitle(/Tapline/);
	await expect(page.getByRole('heading', { level: 1 })).toContainText('Cables out of sight');
	await expect(page.getByRole('heading', { name: 'For car owners' })).toBeVisible();
	await expect(page.getByRole('heading', { name: 'For installers' })).toBeVisible();
	await expect(page.getByRole('heading', { name: 'Safety first' })).toBeVisible();
	await page.getByRole('link', { name: 'I need a fit' }).click();
	await expect(page).toHaveURL(/\/sign-up\?as=owner/);
	await expect(page.getByRole('radio', { name: /A car owner/ })).toBeChecked();
});

test('the fonts ship with the app (no font CDN)', async ({ page, baseURL }) => {
	const origin = new URL(baseURL ?? 'http://127.0.0.1').origin;
	const external: string[] = [];
	page.on('request', (req) => {
		const url = new URL(req.url());
		if (url.protocol !== 'data:' && url.origin !== origin) external.push(req.url());
	});
	await page.goto('/');
	await page.evaluate(() => document.fonts.ready);
	expect(await page.evaluate(() => document.fonts.check('16px Nunito'))).toBe(true);
	expect(external).toEqual([]);
});

test('on a phone the main navigation stays reachable', async ({ page }) => {
	await page.setViewportSize({ width: 375, height: 740 });
	await page.goto('/');
	const nav = page.getByRole('navigation', { name: 'Main (small screens)' });
	await expect(nav).toBeVisible();
	await expect(nav.getByRole('link', { name: 'For installers' })).toBeVisible();
});

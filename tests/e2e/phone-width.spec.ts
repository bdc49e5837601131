import type { Page } from '@playwright/test';
import { DEMO, expect, signIn, test } from './fixtures';

// A small phone held upright (360 CSS px is the narrowest common Android width).
const PHONE = { width: 360, height: 740 };

/** Every page listed, the ones too wide for the phone with their widths. */
async function tooWide(page: Page, paths: readonly string[]) {
	const wide: string[] = [];
	for (const path of paths) {
		const response = await page.goto(path);
		expect(response?.status(), path).toBeLessThan(400);
		// Maps and tables that fill in after load can widen the page; wait for the network to settle.
		await page.waitForLoadState('networkidle');
		const width = await page.evaluate(() => document.documentElement.scrollWidth);
		if (width > PHONE.width) wide.push(`${path}: ${width} px`);
	}
	return wide;
}

/** The first link on a page whose address matches, as a path. */
async function firstLink(page: Page, from: string, pattern: RegExp) {
	await page.goto(from);
	const hrefs = await page
		.locator('a[href]')
		.evaluateAll((links) => links.map((a) => a.getAttribute('href') ?? ''));
	const href = hrefs.find((h) => pattern.test(h));
	expect(href, `a link matching ${pattern} on ${from}`).toBeTruthy();
	return href!;
}

test.use({ viewport: PHONE });

test('public and sign-in pages fit a 360 px phone', async ({ page }) => {
	const profile = await firstLink(page, '/', /^\/installers\/[0-9a-f-]{36}$/).catch(() => null);
	const paths = ['/', '/sign-in', '/sign-up', '/forgot-password', ...(profile ? [profile] : [])];
	expect(await tooWide(page, paths)).toEqual([]);
});

test("an owner's pages fit a 360 px phone", async ({ page }) => {
	await signIn(page, DEMO.owner);
	const job = await firstLink(page, '/owner', /^\/owner\/jobs\/[0-9a-f-]{36}$/);
	const paths = ['/owner', '/owner/jobs/new', job, `${job}/quotes`, '/account', '/owner/payments'];
	const quote = await firstLink(page, `${job}/quotes`, /\/quotes\/[0-9a-f-]{36}$/).catch(
		() => null
	);
	if (quote) paths.push(quote);
	// A new draft, for the steps of the request form.
	await page.goto('/owner/jobs/new');
	await page.getByRole('button', { name: 'Start' }).click();
	await expect(page).toHaveURL(/\/vehicle$/);
	const draft = new URL(page.url()).pathname.replace(/\/vehicle$/, '');
	for (const step of ['vehicle', 'cameras', 'power', 'place', 'photos', 'review']) {
		paths.push(`${draft}/${step}`);
	}
	expect(await tooWide(page, paths)).toEqual([]);
});

test("an installer's pages fit a 360 px phone", async ({ page }) => {
	await signIn(page, DEMO.installer);
	const job = await firstLink(page, '/installer/jobs', /^\/installer\/jobs\/[0-9a-f-]{36}$/);
	const paths = [
		'/installer',
		'/installer/jobs',
		job,
		'/installer/application',
		'/installer/documents',
		'/installer/service-area',
		'/installer/hours',
		'/installer/fits',
		'/installer/quotes',
		'/installer/messages',
		'/installer/fit-notes',
		'/account',
		'/installer/payouts'
	];
	expect(await tooWide(page, paths)).toEqual([]);
});

test("an admin's pages fit a 360 px phone", async ({ page }) => {
	await signIn(page, DEMO.admin);
	const application = await firstLink(page, '/admin/vetting', /^\/admin\/vetting\/[0-9a-f-]{36}$/);
	const account = await firstLink(page, '/admin/users', /^\/admin\/users\/[0-9a-f-]{36}$/);
	const paths = [
		'/admin',
		'/admin/vetting',
		application,
		'/admin/team',
		'/admin/users',
		account,
		'/account',
		'/admin/payments',
		'/admin/settings',
		'/admin/bookings',
		'/admin/payouts'
	];
	const booking = await firstLink(
		page,
		'/admin/bookings',
		/^\/admin\/bookings\/[0-9a-f-]{36}$/
	).catch(() => null);
	if (booking) paths.push(booking);
	expect(await tooWide(page, paths)).toEqual([]);
});

test("the refusal hooks send (403, src/error.html) has the site's frame, face and icon", async ({
	page
}) => {
	await signIn(page, DEMO.owner);
	const response = await page.goto('/admin');
	expect(response?.status()).toBe(403);
	await expect(page.getByRole('heading', { name: /Not for this account/ })).toBeVisible();
	await expect(page.getByRole('link', { name: 'Tapline home' })).toBeVisible();
	await expect(page.getByRole('link', { name: 'Back to the start' })).toBeVisible();
	await expect(page.locator('link[rel=icon]')).toHaveAttribute('href', '/favicon.svg');
	// The page's own face, loaded from the app (its CSP allows fonts from 'self' only).
	const nunito = await page.evaluate(async () => {
		await document.fonts.ready;
		return document.fonts.check('900 16px Nunito') && document.fonts.status === 'loaded';
	});
	expect(nunito).toBe(true);
	const loaded = await page.evaluate(() =>
		[...document.fonts].filter((f) => f.status === 'loaded').map((f) => f.family)
	);
	expect(loaded).toContain('Nunito');
	expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
		PHONE.width
	);
});

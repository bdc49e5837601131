import { readFile } from 'node:fs/promises';
import { parse } from 'csv-parse/sync';
import { DEMO, expect, signIn, test } from './fixtures';

test('an admin lists bookings and downloads the same rows as CSV; others are refused', async ({
	page,
	browser
}) => {
	await signIn(page, DEMO.admin);
	await page.getByRole('link', { name: 'Bookings' }).first().click();
	await expect(page.getByRole('heading', { name: 'Bookings' })).toBeVisible();
	const shown = await page.getByTestId('booking-row').count();
	const download = page.waitForEvent('download');
	await page.getByRole('link', { name: 'Download these as CSV' }).click();
	const file = await (await download).path();
	const records = parse(await readFile(file, 'utf8')) as string[][];
	expect(records[0]?.[0]).toBe('Booking');
	// The first page of the table and the start of the file are the same bookings.
	expect(records.length - 1).toBeGreaterThanOrEqual(shown);

	const owner = await browser.newPage();
	await signIn(owner, DEMO.owner);
	for (const path of ['/admin/bookings', '/admin/bookings/bookings.csv']) {
		const res = await owner.request.get(path, { maxRedirects: 0 });
		expect(res.status(), path).toBe(403);
	}
	const anonymous = await browser.newPage();
	const res = await anonymous.request.get('/admin/bookings/bookings.csv', { maxRedirects: 0 });
	expect(res.status()).toBe(303);
});

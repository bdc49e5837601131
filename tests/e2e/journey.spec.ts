/**
 * The whole journey through the pages, as its people would walk it: a new owner posts a job; the
 * demo installer quotes it; the owner books and pays into held funds on the provider's page; the
 * installer files the fit report; the owner reads the install record and confirms; the funds are
 * released; both sides review and then see each other's review; an admin finds the booking, reads
 * its timeline and downloads the payout in the payouts CSV.
 */
import { readFile } from 'node:fs/promises';
import type { Page } from '@playwright/test';
import { parse } from 'csv-parse/sync';
import { DEMO, expect, jpegPhoto, signIn, test } from './fixtures';
import { fileFitReport } from './support/fit-booking';
import { closeQueries, newAccount } from './support/requests';

test.afterAll(closeQueries);

const inDays = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10);

async function rate(page: Page, stars: Record<string, number>, text: string) {
	for (const [aspect, n] of Object.entries(stars)) {
		await page
			.getByRole('group', { name: aspect })
			.getByRole('radio', { name: `${String(n)} ${n === 1 ? 'star' : 'stars'}`, exact: true })
			.check();
	}
	await page.getByLabel('Your review').fill(text);
	await page.getByRole('button', { name: 'Send the review' }).click();
}

async function payWithCard(page: Page, card: string) {
	await page.getByLabel('Card number').fill(card);
	await page.getByLabel('Expiry (MM / YY)').fill('12 / 34');
	await page.getByLabel('CVC').fill('123');
	await page.getByRole('button', { name: /^Pay \$/ }).click();
}

test('post, quote, book, pay, fit report, confirm, release, both reviews, and the admin finds the payout', async ({
	browser
}) => {
	test.setTimeout(240_000);
	const model = `Journeyer${Date.now().toString(36)}`;
	const title = `2019 Demo ${model}`;

	// The owner posts a front-camera, hard-wired job at the installer's workshop in Norwood.
	const ownerAccount = await newAccount(browser, 'owner', 'journey-owner');
	const owner = await ownerAccount.context.newPage();
	await owner.goto('/owner');
	await owner.getByRole('button', { name: 'Describe a new job' }).click();
	await owner.getByLabel('Make').fill('Demo');
	await owner.getByLabel('Model').fill(model);
	await owner.getByLabel('Year').fill('2019');
	await owner.getByLabel('Body style').selectOption('hatchback');
	await owner.getByText('Mini blade').click();
	await owner.getByLabel('Battery type').selectOption('agm');
	await owner.getByRole('radio', { name: 'No', exact: true }).check();
	await owner.getByRole('button', { name: 'Save and continue' }).click();
	await expect(owner.getByRole('heading', { name: 'The cameras' })).toBeVisible();
	await owner.getByText('Front only', { exact: true }).click();
	await owner.getByText('I already have the camera').click();
	await owner.getByRole('button', { name: 'Save and continue' }).click();
	await expect(owner.getByRole('heading', { name: 'Power' })).toBeVisible();
	await owner.getByText('Hard-wired with parking mode').click();
	await owner.getByRole('button', { name: 'Save and continue' }).click();
	await expect(owner.getByRole('heading', { name: 'Where and when' })).toBeVisible();
	await owner.getByText("At the installer's workshop").click();
	await owner.getByLabel('Suburb or postcode').fill('Norwood');
	await owner.getByRole('button', { name: 'Show on map' }).click();
	await expect(owner.getByTestId('map-picker-point')).toContainText('-34.92');
	await owner.getByLabel('Choice 1: date').fill(inDays(6));
	await owner.getByRole('button', { name: 'Save and continue' }).click();
	await expect(owner.getByRole('heading', { name: 'Photos (optional)' })).toBeVisible();
	await owner.getByRole('button', { name: 'Continue to review' }).click();
	await owner.getByRole('button', { name: 'Post this job for quotes' }).click();
	await expect(owner.getByTestId('job-status')).toHaveText('Open for quotes');
	const jobId = /\/owner\/jobs\/([0-9a-f-]{36})/.exec(owner.url())![1]!;

	// The demo installer (Norwood, 30 km, payouts set up) quotes it with the offered times.
	const installerContext = await browser.newContext();
	const installer = await installerContext.newPage();
	await signIn(installer, DEMO.installer);
	await installer.goto(`/installer/jobs/${jobId}`);
	await expect(installer.getByRole('heading', { name: title })).toBeVisible();
	await expect(installer.getByTestId('quote-fee-rule')).toContainText('% of the total');
	const form = installer.getByTestId('quote-form');
	await form.getByLabel(/^Labour \(\$/).fill('240.00');
	await expect(form.getByLabel('Time 3: date')).not.toHaveValue('');
	await form.getByRole('button', { name: 'Send the quote' }).click();
	await expect(installer.getByText(/Quote sent \(revision 1\)/)).toBeVisible();
	await expect(installer.getByTestId('quote-fee-line')).toContainText('pays you $');

	// The owner books the third time offered (the demo installer's earlier days stay free for
	// the other journeys) and pays on the provider's page.
	await owner.goto(`/owner/jobs/${jobId}/quotes`);
	await owner
		.getByTestId('quote-row')
		.first()
		.getByRole('link', { name: 'Details and booking' })
		.click();
	await owner.getByRole('radio').nth(2).check();
	await owner.getByRole('button', { name: 'Book this time' }).click();
	await expect(owner.getByTestId('booking-status')).toHaveText('Provisional: waiting for payment');
	const bookingId = /\/owner\/bookings\/([0-9a-f-]{36})/.exec(owner.url())![1]!;
	await owner.getByRole('button', { name: 'Pay into held funds' }).click();
	await payWithCard(owner, '4242 4242 4242 4242');
	await expect(owner.getByTestId('booking-status')).toHaveText('Confirmed');
	await expect(owner.getByTestId('fit-stage')).toContainText('waiting to be fitted');

	// On the day the installer files the fit report (front camera only: no demister item).
	await fileFitReport(installer, bookingId, await jpegPhoto(), { rear: false });
	await expect(installer.getByTestId('install-record')).toContainText('F12 cabin box');

	// The owner reads the install record and confirms; the funds are released.
	await owner.reload();
	await expect(owner.getByTestId('fit-stage')).toContainText('waiting for the owner to confirm');
	await owner.getByTestId('record-link').click();
	await expect(owner.getByTestId('install-record')).toContainText(
		'Fuse F12 cabin box: original 10 A, added circuit 5 A (mini blade)'
	);
	await owner.goto(`/owner/bookings/${bookingId}`);
	await owner.getByText('Confirm the work').click();
	await owner
		.getByRole('button', { name: 'Yes, the work is done well: release the funds' })
		.click();
	await expect(
		owner.getByText(/the work is confirmed and \$[\d.,]+ has been released/)
	).toBeVisible();

	// Both review; each sees the other's once both are in.
	await owner.goto(`/owner/bookings/${bookingId}/review`);
	await rate(
		owner,
		{ Workmanship: 5, Tidiness: 5, Communication: 4, Punctuality: 5 },
		'Neat work, every cable out of sight.'
	);
	await expect(owner.getByTestId('review-mine-hidden')).toBeVisible();
	await installer.goto(`/installer/bookings/${bookingId}/review`);
	await rate(
		installer,
		{ 'Vehicle ready and accessible': 5, Communication: 5, 'Accurate job description': 5 },
		'Car ready on time, job exactly as posted.'
	);
	await expect(installer.getByText('Neat work, every cable out of sight.')).toBeVisible();
	await owner.goto(`/owner/bookings/${bookingId}/review`);
	await expect(owner.getByText('Car ready on time, job exactly as posted.')).toBeVisible();

	// The admin finds the booking, reads its timeline, and downloads the payout.
	const adminContext = await browser.newContext();
	const admin = await adminContext.newPage();
	await signIn(admin, DEMO.admin);
	await admin.goto(`/admin/bookings?q=${model}`);
	await admin.getByTestId('booking-row').getByRole('link', { name: title }).click();
	await expect(admin).toHaveURL(new RegExp(`/admin/bookings/${bookingId}$`));
	const timeline = admin.getByTestId('timeline');
	await expect(timeline).toContainText('Fit report filed (visit 1)');
	await expect(timeline).toContainText('Work confirmed by the owner');
	await expect(timeline).toContainText('Released');
	await admin.goto('/admin/payouts');
	const payoutRow = admin.getByTestId('payout-row').filter({ hasText: title });
	await expect(payoutRow).toBeVisible();
	const download = admin.waitForEvent('download');
	await admin.getByRole('link', { name: 'Download these as CSV' }).click();
	const records = parse(await readFile(await (await download).path(), 'utf8')) as string[][];
	const record = records.find((r) => r[0] === bookingId);
	expect(record, 'the payout is in the CSV').toBeTruthy();
	await expect(payoutRow.getByRole('cell').nth(5)).toHaveText(`$${record![7]!}`);

	await ownerAccount.context.close();
	await installerContext.close();
	await adminContext.close();
});

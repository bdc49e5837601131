/**
 * The end of a booking: the installer files the fit report on a phone with a photo, the owner
 * reads the install record (page and PDF) and confirms the work, and the installer's payout shows.
 * The booking is written straight into the database between two new accounts (the demo has no
 * bookings); payment and payout go through the payments fake as in the app.
 */
import { expect, jpegPhoto, test } from './fixtures';
import { fileFitReport, PHONE, paidBooking } from './support/fit-booking';
import { closeQueries, newAccount } from './support/requests';

test.afterAll(closeQueries);

test('the installer files the fit report on a phone; the owner reads the record and confirms; the payout shows', async ({
	browser
}) => {
	test.setTimeout(120_000);
	const { bookingId, title, ownerPage, phone } = await paidBooking(browser, 'fit');
	await expect(ownerPage.getByTestId('fit-stage')).toContainText('waiting to be fitted');

	// On the day: the report, on a phone. Skipped items are refused, each at its place.
	await phone.goto(`/installer/bookings/${bookingId}/report`);
	await expect(phone.getByRole('heading', { name: 'Fit report' })).toBeVisible();
	await expect(phone.getByText('Before you sign off')).toBeVisible();
	expect(await phone.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
		PHONE.width
	);
	await phone.getByRole('button', { name: 'File the fit report' }).click();
	await expect(phone.getByTestId('item-tapOrientation')).toContainText(
		'Tick this, or mark it "does not apply" and say why'
	);
	// Then every item answered, with a photo (the shared filling; it waits for the record).
	await fileFitReport(phone, bookingId, await jpegPhoto(), { rear: true });
	await expect(phone.getByText(/^Fit report filed/)).toBeVisible();
	const record = phone.getByTestId('install-record');
	await expect(record).toContainText(
		'Fuse F12 cabin box: original 10 A, added circuit 5 A (mini blade)'
	);
	await expect(record).toContainText('Does not apply: No curtain airbags in this vehicle');
	// The page fits the phone: nothing wider than the screen.
	expect(await phone.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
		PHONE.width
	);

	// The owner: stage, deadline, the record with its photo and PDF, then confirms.
	await ownerPage.reload();
	await expect(ownerPage.getByTestId('fit-stage')).toContainText(
		'fitted and waiting for the owner to confirm'
	);
	await expect(ownerPage.getByTestId('confirm-by')).toContainText('confirm it, or raise a problem');
	await expect(ownerPage.getByRole('link', { name: 'Raise a problem' })).toHaveAttribute(
		'href',
		`/owner/bookings/${bookingId}/problem`
	);
	await ownerPage.getByTestId('record-link').click();
	await expect(ownerPage.getByTestId('record-vehicle')).toHaveText('Demo Hatch 2019 (hatchback)');
	await expect(ownerPage.getByTestId('install-record')).toContainText('2 × Mini blade fuse tap');
	const photo = ownerPage.getByTestId('record-photo');
	await expect(photo).toHaveCount(1);
	await expect
		.poll(() => photo.evaluate((img: HTMLImageElement) => img.naturalWidth))
		.toBeGreaterThan(0);
	// Nobody else reads the record, its PDF or its photos: 404, not even a hint it exists.
	const photoSrc = await photo.getAttribute('src');
	const stranger = await newAccount(browser, 'owner', 'fit-stranger');
	for (const path of [
		`/owner/bookings/${bookingId}/record`,
		`/owner/bookings/${bookingId}/record.pdf`,
		photoSrc!
	]) {
		expect((await stranger.request.get(path)).status(), path).toBe(404);
	}
	await stranger.context.close();
	const pdf = await ownerPage.request.get(`/owner/bookings/${bookingId}/record.pdf`);
	expect(pdf.status()).toBe(200);
	expect(pdf.headers()['content-type']).toBe('application/pdf');
	expect((await pdf.body()).subarray(0, 5).toString('latin1')).toBe('%PDF-');

	await ownerPage.goto(`/owner/bookings/${bookingId}`);
	await ownerPage.getByText('Confirm the work').click();
	await ownerPage
		.getByRole('button', { name: 'Yes, the work is done well: release the funds' })
		.click();
	await expect(
		ownerPage.getByText(/the work is confirmed and \$[\d.,]+ has been released/)
	).toBeVisible();
	await expect(ownerPage.getByTestId('fit-stage')).toContainText('confirmed');
	await expect(ownerPage.getByTestId('confirm-by')).toHaveCount(0);

	// The installer's payout is on their list.
	await phone.goto('/installer/payouts');
	const row = phone.getByTestId('payout-history').getByRole('row').filter({ hasText: title });
	await expect(row).toBeVisible();
	await expect(row).not.toContainText('Held until done');
	// 'Paid to you': the release less Tapline's fee.
	await expect(row.getByRole('cell').nth(4)).toHaveText(/^\$\d+\.\d{2}$/);
});

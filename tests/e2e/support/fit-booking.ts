/**
 * A paid booking between a new owner and a new vetted installer with payouts set up, for the fit
 * report specs. The job, quote and provisional booking are written straight into the database (the
 * demo has no bookings); payouts set-up and payment go through the payments fake's own pages, with
 * JavaScript on, as in the app.
 */
import { expect, type Browser, type Page } from '@playwright/test';
import { signIn } from '../fixtures';
import { BASE_URL, newAccount, newInstallerWithProfile, query } from './requests';

export const PASSWORD = 'long enough passphrase';
export const PHONE = { width: 375, height: 740 };

/** A job request as the owner's steps store it: a hatch, mini blade fuses, front and rear. */
export const REQUEST = {
	make: 'Demo',
	model: 'Hatch',
	year: '2019',
	bodyStyle: 'hatchback',
	fuseFamily: 'mini',
	batteryType: 'agm',
	startStop: false,
	hybridOrEv: false,
	curtainAirbags: 'no',
	cameras: 'front-rear',
	cameraSupply: 'owner',
	power: 'hardwired-parking',
	removeOldUnit: false
};
const LINES = [
	{ kind: 'labour', label: 'Fitting', quantity: 1, unitCents: 22000, totalCents: 22000 },
	{ kind: 'part', label: 'Mini blade fuse tap', quantity: 2, unitCents: 650, totalCents: 1300 }
];

/** A provisional booking of a new owner's job with a new installer, 200 days out. */
async function provisionalBooking(ownerId: string, installerId: string, title: string) {
	const [row] = await query<{ id: string }>(
		`with j as (insert into job (owner_id, title, status, request, cameras, power, body_style, suburb)
			values ($1, $3, 'booked', $4::jsonb, 'front-rear', 'hardwired-parking', 'hatchback', 'Walkerville')
			returning id),
		q as (insert into quote (job_id, installer_id, status, total_cents, lines)
			select j.id, $2, 'accepted', 23300, $5::jsonb from j returning id, job_id)
		insert into booking (job_id, quote_id, installer_id, owner_id, slot_start, slot_end,
			status, hold_expires_at, total_cents)
		select q.job_id, q.id, $2, $1, now() + interval '200 days', now() + interval '200 days 2 hours',
			'awaiting_payment', now() + interval '30 minutes', 23300 from q
		returning id`,
		[ownerId, installerId, title, JSON.stringify(REQUEST), JSON.stringify(LINES)]
	);
	return row!.id;
}

async function payWithCard(page: Page, card: string) {
	await page.getByLabel('Card number').fill(card);
	await page.getByLabel('Expiry (MM / YY)').fill('12 / 34');
	await page.getByLabel('CVC').fill('123');
	await page.getByRole('button', { name: /^Pay \$/ }).click();
}

/**
 * A paid booking: the installer (on a phone-sized page, JavaScript as `installerJavaScript`) and
 * the owner's page (JavaScript on), both signed in.
 */
export async function paidBooking(browser: Browser, label: string, installerJavaScript = true) {
	const title = `Fit report hatch ${Date.now().toString(36)}`;
	const owner = await newAccount(browser, 'owner', `${label}-owner`);
	const installer = await newInstallerWithProfile(browser, `${label}-installer`);
	await query(`UPDATE installer_profile SET vetting_status = 'approved' WHERE user_id = $1`, [
		installer.id
	]);
	const setup = await (
		await browser.newContext({ baseURL: BASE_URL, javaScriptEnabled: true })
	).newPage();
	await signIn(setup, installer.email, PASSWORD);
	await setup.goto('/installer/payouts');
	await setup.getByRole('button', { name: 'Set up payouts' }).click();
	await setup.getByLabel('Business name').fill('Fit Report Test Fitting');
	await setup.getByLabel('BSB').fill('000-000');
	await setup.getByLabel('Account number').fill('000123456');
	await setup.getByRole('button', { name: 'Agree and submit' }).click();
	await expect(setup.getByTestId('payouts-status')).toHaveText('Payouts are set up.');
	await setup.context().close();

	const bookingId = await provisionalBooking(owner.id, installer.id, title);
	const ownerPage = await (
		await browser.newContext({ baseURL: BASE_URL, javaScriptEnabled: true })
	).newPage();
	await signIn(ownerPage, owner.email, PASSWORD);
	await ownerPage.goto(`/owner/bookings/${bookingId}`);
	await ownerPage.getByRole('button', { name: 'Pay into held funds' }).click();
	await payWithCard(ownerPage, '4242 4242 4242 4242');
	await expect(ownerPage.getByTestId('booking-status')).toHaveText('Confirmed');
	await owner.context.close();
	await installer.context.close();

	const phone = await (
		await browser.newContext({
			baseURL: BASE_URL,
			viewport: PHONE,
			javaScriptEnabled: installerJavaScript
		})
	).newPage();
	await signIn(phone, installer.email, PASSWORD);
	return { bookingId, title, ownerPage, phone };
}

/**
 * Fills and files the fit report of a booking as its installer would: both supplies tapped, tap
 * orientation checked, a bare-metal ground, a 12.0 V cut-off, the checks done, no curtain airbags,
 * 95 minutes and one photo. `rear` says whether the job has a rear camera (the demister item).
 */
export async function fileFitReport(
	page: Page,
	bookingId: string,
	photo: Buffer,
	options: { rear: boolean; fuseFamily?: string } = { rear: true }
) {
	await page.goto(`/installer/bookings/${bookingId}/report`);
	await expect(page.getByRole('heading', { name: 'Fit report' })).toBeVisible();
	const item = (name: string) => page.getByTestId(`item-${name}`);
	for (const [side, position, original] of [
		['switchedTap', 'F12 cabin box', '10'],
		['permanentTap', 'F30 cabin box', '15']
	] as const) {
		await item(side)
			.getByRole('radio', { name: /^Tapped/ })
			.check();
		await item(side).getByLabel('Fuse position', { exact: true }).fill(position);
		await item(side).getByLabel('Original fuse', { exact: true }).selectOption(original);
		await item(side).getByLabel('Added circuit fuse', { exact: true }).selectOption('5');
	}
	await expect(page.getByLabel('Fuse family of the taps')).toHaveValue(
		options.fuseFamily ?? 'mini'
	);
	await item('tapOrientation')
		.getByRole('radio', { name: /^Checked/ })
		.check();
	await item('ground')
		.getByRole('radio', { name: /^Grounded/ })
		.check();
	await item('ground')
		.getByLabel('Ground point', { exact: true })
		.fill('Kick-panel stud, passenger side');
	await item('ground')
		.getByRole('checkbox', { name: /^On bare metal/ })
		.check();
	await item('cutOff').getByRole('radio', { name: /^Set/ }).check();
	await item('cutOff').getByLabel('Cut-off voltage (V)', { exact: true }).fill('12.0');
	const checks = ['parkingMode', 'cableHidden', 'cameraPlacement'];
	if (options.rear) checks.push('rearDemister');
	for (const name of checks) {
		await item(name)
			.getByRole('radio', { name: /^Checked/ })
			.check();
	}
	if (!options.rear) await expect(item('rearDemister')).toHaveCount(0);
	await item('airbagRouting')
		.getByRole('radio', { name: /^Does not apply/ })
		.check();
	await item('airbagRouting')
		.getByLabel('Why it does not apply', { exact: true })
		.fill('No curtain airbags in this vehicle');
	await page.getByLabel('Minutes on the vehicle').fill('95');
	await page.getByLabel('Photos').setInputFiles({
		name: 'fuse-box.jpg',
		mimeType: 'image/jpeg',
		buffer: photo
	});
	await page.getByRole('button', { name: 'File the fit report' }).click();
	await expect(page).toHaveURL(new RegExp(`/installer/bookings/${bookingId}/record$`));
}

/**
 * On the owner's "Raise a problem" page: picks the cable-or-trim reason, describes it, adds one
 * photo and raises it; waits for the confirmation.
 */
export async function raiseProblem(page: Page, description: string, photo: Buffer) {
	await page.getByLabel('Cable visible or trim damaged').check();
	await page.getByLabel('Tell us what happens').fill(description);
	await page.locator('input[name="photos"]').setInputFiles({
		name: 'trim.jpg',
		mimeType: 'image/jpeg',
		buffer: photo
	});
	await page.getByRole('button', { name: 'Raise the problem' }).click();
	await expect(page.getByText('Problem raised.')).toBeVisible();
}

/**
 * A booking that ends in a partial refund: the owner pays through the provider's page, the
 * installer files the fit report, the owner raises a problem with a photo, the installer answers
 * from the e-mailed link, and an admin settles with a partial refund; both sides then read the
 * outcome. Rules: the lifecycle issue's "Disputes".
 */
import type { Page } from '@playwright/test';
import { DEMO, expect, jpegPhoto, linkIn, signIn, test, waitForMail } from './fixtures';
import { fileFitReport, raiseProblem, REQUEST } from './support/fit-booking';
import { closeQueries, newAccount, query, signedIn } from './support/requests';

test.afterAll(closeQueries);

// A vetted demo installer with payouts set up in the fake, used by no other spec.
const INSTALLER = 'sione.latu@tapline.test';
const TOTAL_CENTS = 35_300;

/** Fills the payment page's card form (any future expiry and CVC) and pays. */
async function payWithCard(page: Page, card: string) {
	await page.getByLabel('Card number').fill(card);
	await page.getByLabel('Expiry (MM / YY)').fill('12 / 34');
	await page.getByLabel('CVC').fill('123');
	await page.getByRole('button', { name: /^Pay \$/ }).click();
}

test('owner raises a problem, installer responds, an admin settles with a partial refund', async ({
	page,
	browser
}) => {
	const title = `Dispute hatch ${Date.now().toString(36)}`;
	const owner = await newAccount(browser, 'owner', 'dispute-owner');
	// A booked job waiting for payment, on a slot far ahead no other test uses (set-up only).
	const hour = Math.floor(Date.now() / 3_600_000) % 5000;
	const [made] = await query<{ booking_id: string }>(
		`with i as (select id from "user" where email = $2),
		j as (insert into job (owner_id, title, status, request, cameras, power, body_style, suburb)
			values ($1, $3, 'booked', $6::jsonb, 'front-rear', 'hardwired-parking', 'hatchback', 'Walkerville')
			returning id),
		q as (insert into quote (job_id, installer_id, status, total_cents)
			select j.id, i.id, 'accepted', $4 from j, i returning id, job_id, installer_id)
		insert into booking (job_id, quote_id, installer_id, owner_id, slot_start, slot_end,
			status, hold_expires_at, total_cents)
		select q.job_id, q.id, q.installer_id, $1,
			timestamptz '2029-01-01T00:00:00Z' + make_interval(hours => $5),
			timestamptz '2029-01-01T02:00:00Z' + make_interval(hours => $5),
			'awaiting_payment', now() + interval '30 minutes', $4 from q
		returning id as booking_id`,
		[owner.id, INSTALLER, title, TOTAL_CENTS, hour * 3, JSON.stringify(REQUEST)]
	);
	const bookingId = made!.booking_id;
	const ownerPage = await owner.context.newPage();

	// The owner pays into held funds on the provider's page.
	await ownerPage.goto(`/owner/bookings/${bookingId}`);
	await ownerPage.getByRole('button', { name: 'Pay into held funds' }).click();
	await payWithCard(ownerPage, '4242 4242 4242 4242');
	await expect(ownerPage.getByTestId('booking-status')).toHaveText('Confirmed');

	// The installer files the fit report through the page: the owner's 72-hour window opens.
	const installer = await signedIn(browser, INSTALLER);
	const reporting = await installer.newPage();
	await fileFitReport(reporting, bookingId, await jpegPhoto(), { rear: true });
	await reporting.close();
	await ownerPage.reload();
	await ownerPage.getByTestId('fit-stage').getByRole('link', { name: 'Raise a problem' }).click();
	await expect(ownerPage.getByRole('heading', { name: 'Raise a problem' })).toBeVisible();
	await raiseProblem(
		ownerPage,
		'The rear cable hangs below the headliner and a trim clip is broken.',
		await jpegPhoto()
	);
	await expect(ownerPage.getByTestId('dispute-status')).toHaveText('Open: with a Tapline admin');
	const opened = ownerPage.getByTestId('dispute-timeline').locator('[data-kind="opened"]');
	await expect(opened).toContainText('a trim clip is broken');
	await expect(opened.getByRole('img')).toBeVisible();

	// The installer follows the e-mailed link and answers with their side.
	const mail = await waitForMail(INSTALLER, new RegExp(`A problem was raised: ${title}`));
	const installerPage = await installer.newPage();
	await installerPage.goto(linkIn(mail, '/installer/bookings/'));
	await expect(installerPage.getByTestId('dispute-timeline')).toContainText('trim clip is broken');
	await installerPage
		.getByLabel('Your response')
		.fill('The clip was already cracked; I can refit the cable along the headliner.');
	await installerPage.getByRole('button', { name: 'Send my response' }).click();
	await expect(installerPage.getByText('Your response is on the timeline.')).toBeVisible();
	await waitForMail(owner.email, new RegExp(`New on the dispute: ${title}`));

	// The admin sees the count beside the navigation, the queue, and settles.
	await signIn(page, DEMO.admin);
	const navCount = page
		.getByRole('navigation', { name: 'Main', exact: true })
		.getByRole('link', { name: /Disputes/ })
		.getByTestId('nav-count');
	await expect(navCount).toBeVisible();
	await page.goto('/admin/disputes');
	await page.getByTestId('dispute-queue').getByRole('link', { name: title }).click();
	const timeline = page.getByTestId('dispute-timeline');
	await expect(timeline.locator('[data-kind="installer_response"]')).toContainText(
		'already cracked'
	);
	await expect(page.getByTestId('dispute-held')).toContainText('$353.00 · $353.00');
	// The tick is checked on the server: a settlement posted without it moves no money.
	const unticked = await page.request.post(`${page.url()}?/settle`, {
		form: { outcome: 'full_refund', note: 'Posted straight to the server, no tick.' },
		headers: { origin: new URL(page.url()).origin, 'x-sveltekit-action': 'true' }
	});
	expect(await unticked.text()).toContain('Tick the box to confirm');
	const [stillOpen] = await query<{ status: string }>(
		`select d.status from dispute d where d.booking_id = $1`,
		[bookingId]
	);
	expect(stillOpen!.status).not.toBe('settled');
	await page.getByLabel('Part refunded to the owner, the rest released').check();
	await page.getByLabel(/Refund to the owner/).fill('50');
	await page
		.getByLabel('Explanation for both sides')
		.fill('The clip needs replacing: $50.00 back to the owner, the rest to the installer.');
	// A partial refund of everything is refused with a message first.
	await page.getByLabel(/Refund to the owner/).fill('353');
	await page.getByLabel('I have read both sides').check();
	await page.getByRole('button', { name: 'Settle the dispute' }).click();
	await expect(page.getByRole('alert')).toContainText('less than the $353.00 held');
	await page.getByLabel('Part refunded to the owner, the rest released').check();
	await page.getByLabel(/Refund to the owner/).fill('50');
	await page.getByLabel('I have read both sides').check();
	await page.getByRole('button', { name: 'Settle the dispute' }).click();
	await expect(page.getByText('Settled. Both sides have been e-mailed the outcome.')).toBeVisible();
	await expect(page.getByTestId('dispute-status')).toHaveText('Settled');
	await expect(page.getByTestId('settle-form')).toHaveCount(0);

	// The money: $50.00 refunded, the $303.00 rest released with the fee on it only.
	const [settled] = await query<{ refund_cents: number; payout_cents: number; fee_cents: number }>(
		`select refund_cents, payout_cents, fee_cents from dispute d join booking b on b.id = d.booking_id
		 where b.id = $1`,
		[bookingId]
	);
	expect(settled!.refund_cents).toBe(5000);
	expect(settled!.payout_cents + settled!.fee_cents).toBe(TOTAL_CENTS - 5000);

	// Both sides read the outcome, and both were e-mailed.
	for (const side of [ownerPage, installerPage]) {
		await side.reload();
		await expect(side.getByTestId('dispute-outcome')).toHaveText(
			'Part refunded to the owner, the rest released'
		);
		await expect(side.getByTestId('dispute-summary')).toContainText(
			'Refunded to the owner: $50.00'
		);
		await expect(side.getByTestId('dispute-entry-form')).toHaveCount(0);
		// The page fits a phone held upright (375 px).
		await side.setViewportSize({ width: 375, height: 740 });
		expect(await side.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
			375
		);
	}
	await page.setViewportSize({ width: 375, height: 740 });
	expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(375);
	await waitForMail(owner.email, new RegExp(`Settled: ${title}`));
	await waitForMail(INSTALLER, new RegExp(`Settled: ${title}`));

	// Nobody else reads it: another owner gets 404, an owner on the admin page 403, another
	// installer 404.
	const disputePath = new URL(page.url()).pathname;
	const stranger = await newAccount(browser, 'owner', 'dispute-stranger');
	expect((await stranger.request.get(`/owner/bookings/${bookingId}/problem`)).status()).toBe(404);
	expect((await owner.request.get(disputePath, { maxRedirects: 0 })).status()).toBe(403);
	const otherInstaller = await signedIn(browser, DEMO.installer);
	expect(
		(await otherInstaller.request.get(`/installer/bookings/${bookingId}/dispute`)).status()
	).toBe(404);
	await Promise.all([
		owner.context.close(),
		installer.close(),
		stranger.context.close(),
		otherInstaller.close()
	]);
});

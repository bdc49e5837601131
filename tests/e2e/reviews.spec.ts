import { expect, test, type Page } from '@playwright/test';
import { DEMO, signIn } from './fixtures';
import { closeQueries, newAccount, newInstallerWithProfile, query } from './support/requests';

test.afterAll(closeQueries);

/**
 * A booking whose work was accepted an hour ago, between a new owner and a new (vetted)
 * installer, written straight into the database: reaching the accepted stage through the pages
 * belongs to the fit-report journey; this spec is about the reviews that follow it.
 */
async function acceptedBooking(browser: import('@playwright/test').Browser) {
	const owner = await newAccount(browser, 'owner', 'review-owner');
	const installer = await newInstallerWithProfile(browser, 'review-installer');
	await query(`update installer_profile set vetting_status = 'approved' where user_id = $1`, [
		installer.id
	]);
	const [row] = await query<{ id: string }>(
		`with j as (insert into job (owner_id, title, status) values ($1, 'Hatchback 2019 front camera', 'booked')
			returning id),
		q as (insert into quote (job_id, installer_id, status, total_cents)
			select j.id, $2, 'accepted', 32450 from j returning id, job_id)
		insert into booking (job_id, quote_id, installer_id, owner_id, slot_start, slot_end,
			status, hold_expires_at, total_cents, stage, accepted_at, accepted_by)
		select q.job_id, q.id, $2, $1, now() - interval '5 days', now() - interval '5 days' + interval '2 hours',
			'confirmed', now() - interval '5 days', 32450, 'accepted', now() - interval '1 hour', 'owner'
		from q
		returning id`,
		[owner.id, installer.id]
	);
	return { id: row!.id, owner, installer };
}

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

test('both sides review blind, then see each other; the installer replies once, in public', async ({
	browser,
	page
}) => {
	const { id, owner, installer } = await acceptedBooking(browser);
	const ownerPage = await owner.context.newPage();
	// A small phone held upright, as in phone-width.spec.ts.
	await ownerPage.setViewportSize({ width: 360, height: 740 });

	// The owner finds the review from the booking page.
	await ownerPage.goto(`/owner/bookings/${id}`);
	await ownerPage
		.getByTestId('review-panel')
		.getByRole('link', { name: 'Write your review' })
		.click();
	await expect(ownerPage).toHaveURL(new RegExp(`/owner/bookings/${id}/review$`));
	// Too short a text is refused with a message, and nothing is saved.
	await rate(ownerPage, { Workmanship: 5, Tidiness: 4, Communication: 4, Punctuality: 4 }, 'Ok');
	await expect(ownerPage.getByText('Write at least 10 characters')).toBeVisible();
	await rate(
		ownerPage,
		{ Workmanship: 5, Tidiness: 4, Communication: 4, Punctuality: 4 },
		'Tidy wiring along the pillar and a clear walk-through.'
	);
	await expect(ownerPage.getByTestId('review-mine-hidden')).toBeVisible();
	await expect(ownerPage.getByTestId('review-form')).toHaveCount(0);
	expect(await ownerPage.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
		360
	);

	// The installer sees only that a review waits, then writes theirs.
	const installerPage = await installer.context.newPage();
	await installerPage.goto(`/installer/bookings/${id}/review`);
	await expect(installerPage.getByTestId('review-waiting')).toContainText('has reviewed you');
	await expect(installerPage.getByText('Tidy wiring along the pillar')).toHaveCount(0);
	await rate(
		installerPage,
		{ 'Vehicle ready and accessible': 5, Communication: 5, 'Accurate job description': 4 },
		'Car was ready and the job was as described.'
	);
	await expect(installerPage.getByText('Tidy wiring along the pillar')).toBeVisible();

	// One public reply.
	await installerPage.getByLabel('Your public reply').fill('Thank you, enjoy the camera.');
	await installerPage.getByRole('button', { name: 'Post the reply' }).click();
	await expect(installerPage.getByTestId('review-reply')).toContainText('enjoy the camera');
	await expect(installerPage.getByTestId('reply-form')).toHaveCount(0);

	// The owner now sees the installer's review.
	await ownerPage.goto(`/owner/bookings/${id}/review`);
	await expect(ownerPage.getByText('Car was ready and the job was as described.')).toBeVisible();

	// The public profile shows it with the reply and the adjusted rating (prior 5 × 4.0, plus 4.25).
	await page.goto(`/installers/${installer.id}`);
	await expect(page.getByTestId('profile-rating')).toHaveText(
		'4.04 ★ adjusted (average 4.25 from 1 review)'
	);
	await expect(page.getByTestId('review')).toContainText('Tidy wiring along the pillar');
	await expect(page.getByTestId('review-reply')).toContainText('enjoy the camera');

	// Someone else's booking is not found.
	await signIn(page, DEMO.owner);
	const other = await page.goto(`/owner/bookings/${id}/review`);
	expect(other?.status()).toBe(404);

	await owner.context.close();
	await installer.context.close();
});

import { randomUUID } from 'node:crypto';
import type { Browser } from '@playwright/test';
import { DEMO, expect, signIn, test } from './fixtures';
import { closeQueries, newAccount, newInstallerWithProfile, query } from './support/requests';

test.afterAll(closeQueries);

// A small phone held upright, as in phone-width.spec.ts.
test.use({ viewport: { width: 360, height: 740 } });

/**
 * A lapsed booking between a new owner and a new installer, with one message, written straight into
 * the database: the demo has no bookings, and a draft job with a declined quote and a lapsed
 * booking shows up on no other page that other tests read.
 */
async function lapsedBooking(browser: Browser, title: string) {
	const owner = await newAccount(browser, 'owner', 'timeline-owner');
	const installer = await newInstallerWithProfile(browser, 'timeline-installer');
	const [row] = await query<{ id: string }>(
		`with j as (insert into job (owner_id, title) values ($1, $3) returning id),
		q as (insert into quote (job_id, installer_id, status, total_cents)
			select j.id, $2, 'declined', 32450 from j returning id, job_id),
		m as (insert into job_message (job_id, installer_id, author_id, body)
			select q.job_id, $2, $1, 'Is a Saturday morning possible?' from q)
		insert into booking (job_id, quote_id, installer_id, owner_id, slot_start, slot_end,
			status, hold_expires_at, total_cents)
		select q.job_id, q.id, $2, $1, '2027-01-10T00:00:00Z', '2027-01-10T02:00:00Z', 'lapsed',
			now(), 32450 from q
		returning id`,
		[owner.id, installer.id, title]
	);
	await installer.context.close();
	return { id: row!.id, owner };
}

test("an admin reads a booking's timeline from the list on a phone; others are refused", async ({
	page,
	browser
}) => {
	const title = `Timeline hatch ${Date.now().toString(36)}`;
	const { id, owner } = await lapsedBooking(browser, title);
	await signIn(page, DEMO.admin);
	await page.goto(`/admin/bookings?q=${encodeURIComponent(title)}`);
	await page.locator(`a[href="/admin/bookings/${id}"]`).click();
	await expect(page).toHaveURL(new RegExp(`/admin/bookings/${id}$`));
	await expect(page.getByTestId('booking-status')).toHaveText('Lapsed: the hold ran out');
	const entries = page.getByTestId('timeline-entry');
	await expect(entries.first()).toContainText('Booked (provisional until paid)');
	await expect(page.getByTestId('timeline')).toContainText('Hold on the slot ends');
	await expect(entries.filter({ hasText: 'Message from the owner' })).toContainText(
		'Is a Saturday morning possible?'
	);
	await expect(page.getByRole('heading', { name: title })).toBeVisible();
	await page.waitForLoadState('networkidle');
	expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);

	const missing = await page.goto(`/admin/bookings/${randomUUID()}`);
	expect(missing?.status()).toBe(404);
	await expect(page.getByText('There is no booking with that id.')).toBeVisible();

	// Not even the booking's own owner reaches the admin's page.
	const res = await owner.request.get(`/admin/bookings/${id}`, { maxRedirects: 0 });
	expect(res.status()).toBe(403);
	await owner.context.close();
});

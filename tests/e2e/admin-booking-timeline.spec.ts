import { randomUUID } from 'node:crypto';
import { DEMO, expect, signIn, test } from './fixtures';
import { closeQueries, query } from './support/requests';

test.afterAll(closeQueries);

// A small phone held upright, as in phone-width.spec.ts.
test.use({ viewport: { width: 360, height: 740 } });

/**
 * A lapsed booking of one of the demo's quotes, written straight into the database: the demo has
 * no bookings, and a lapsed one takes no installer's time, so no other test notices it.
 */
async function lapsedDemoBooking() {
	const [row] = await query<{ id: string }>(
		`insert into booking (job_id, quote_id, installer_id, owner_id, slot_start, slot_end,
			status, hold_expires_at, total_cents)
		 select q.job_id, q.id, q.installer_id, j.owner_id, '2027-01-10T00:00:00Z',
			'2027-01-10T02:00:00Z', 'lapsed', now(), q.total_cents
		 from quote q join job j on j.id = q.job_id
		 order by q.created_at limit 1
		 returning id`
	);
	expect(row, 'a demo quote to book').toBeTruthy();
	return row!.id;
}

test("an admin reads a booking's timeline from the list on a phone; others are refused", async ({
	page,
	browser
}) => {
	const id = await lapsedDemoBooking();
	await signIn(page, DEMO.admin);
	await page.goto('/admin/bookings?status=lapsed');
	await page.locator(`a[href="/admin/bookings/${id}"]`).click();
	await expect(page).toHaveURL(new RegExp(`/admin/bookings/${id}$`));
	await expect(page.getByTestId('booking-status')).toHaveText('Lapsed: the hold ran out');
	const entries = page.getByTestId('timeline-entry');
	await expect(entries.first()).toContainText('Booked (provisional until paid)');
	await expect(page.getByTestId('timeline')).toContainText('Hold on the slot ends');
	await page.waitForLoadState('networkidle');
	expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(360);

	const missing = await page.goto(`/admin/bookings/${randomUUID()}`);
	expect(missing?.status()).toBe(404);
	await expect(page.getByText('There is no booking with that id.')).toBeVisible();

	const owner = await browser.newPage();
	await signIn(owner, DEMO.owner);
	const res = await owner.request.get(`/admin/bookings/${id}`, { maxRedirects: 0 });
	expect(res.status()).toBe(403);
	await owner.close();
});

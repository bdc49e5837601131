/**
 * A paid booking's time, end to end: the demo owner books and pays a quote of the demo installer
 * (on the payments fake's hosted page), the installer proposes a new time, the owner accepts, both
 * pages show the new slot, the installer's calendar shows it, and the .ics file downloads with the
 * new time and a higher SEQUENCE.
 */
import { readFile } from 'node:fs/promises';
import type { Page } from '@playwright/test';
import { formatSlotLabel } from '../../src/lib/work/schedule';
import { formatInZone, localToUtc } from '../../src/lib/time';
import { DEMO, expect, signIn, test, waitForMail } from './fixtures';
import { closeQueries, query } from './support/requests';

const ZONE = 'Australia/Adelaide';

test.afterAll(closeQueries);

async function userId(email: string) {
	const [row] = await query<{ id: string }>(`SELECT id FROM "user" WHERE email = $1`, [email]);
	return row!.id;
}

/** The Adelaide date `days` from now. */
const localDay = (days: number) =>
	formatInZone(new Date(Date.now() + days * 86_400_000), ZONE, 'yyyy-MM-dd');

/**
 * A copy of the demo hatch under its own title with a live quote of the demo installer offering
 * one slot, on days no other test books (60 to 79 days ahead, a different day on a retry).
 */
async function quotedHatch() {
	const tag = Date.now().toString(36);
	const title = `Rescheduled wagon ${tag}`;
	const [job] = await query<{ id: string }>(
		`INSERT INTO job (owner_id, status, draft_step, draft, request, scope, title, body_style,
			cameras, power, location_mode, suburb, postcode, latitude, longitude, address_line,
			time_zone, preferred_windows, price_low_cents, price_high_cents, submitted_at)
		 SELECT owner_id, 'collecting_quotes', draft_step, draft, request, scope, $1, body_style,
			cameras, power, location_mode, suburb, postcode, latitude, longitude, address_line,
			time_zone, preferred_windows, price_low_cents, price_high_cents, now()
		 FROM job WHERE title = '2018 Demo Hatch' ORDER BY created_at LIMIT 1
		 RETURNING id`,
		[title]
	);
	const offset = 60 + (Date.now() % 10) * 2;
	const day = localDay(offset);
	const slot = { start: localToUtc(day, '10:00', ZONE), end: localToUtc(day, '12:00', ZONE) };
	const installer = await userId(DEMO.installer);
	await query(
		`INSERT INTO quote (job_id, installer_id, status, total_cents, slots, expires_at)
		 VALUES ($1, $2, 'live', 25500, $3, now() + interval '14 days')`,
		[job!.id, installer, JSON.stringify([slot])]
	);
	return { jobId: job!.id, title, installer, slot, newDay: localDay(offset + 1) };
}

/** Fills the payment page's card form (any future expiry and CVC) and pays. */
async function payWithCard(page: Page, card: string) {
	await page.getByLabel('Card number').fill(card);
	await page.getByLabel('Expiry (MM / YY)').fill('12 / 34');
	await page.getByLabel('CVC').fill('123');
	await page.getByRole('button', { name: /^Pay \$/ }).click();
}

test('the installer proposes a new time, the owner accepts, and both sides and the calendar show it', async ({
	browser
}) => {
	test.setTimeout(120_000);
	const made = await quotedHatch();

	// The owner books the quote's time and pays on the provider's page.
	const owner = await (await browser.newContext()).newPage();
	await signIn(owner, DEMO.owner);
	await owner.goto(`/owner/jobs/${made.jobId}/quotes/${made.installer}`);
	await owner.getByRole('radio').first().check();
	await owner.getByRole('button', { name: 'Book this time' }).click();
	await expect(owner.getByTestId('booking-status')).toHaveText('Provisional: waiting for payment');
	const bookingPath = new URL(owner.url()).pathname;
	const bookingId = bookingPath.split('/').pop()!;
	await owner.getByRole('button', { name: 'Pay into held funds' }).click();
	await payWithCard(owner, '4242 4242 4242 4242');
	await expect(owner.getByTestId('booking-status')).toHaveText('Confirmed');
	await expect(owner.getByTestId('booked-slot')).toHaveText(formatSlotLabel(made.slot, ZONE));

	// The installer sees the slot and the exact address, and proposes 2–4 pm the next day.
	const installer = await (await browser.newContext()).newPage();
	await signIn(installer, DEMO.installer);
	await installer.goto(`/installer/jobs/${made.jobId}`);
	await expect(installer.getByTestId('booked-details')).toContainText('14 Demo Court');
	await expect(installer.getByTestId('booked-slot')).toHaveText(formatSlotLabel(made.slot, ZONE));
	await installer.getByTestId('booking-time-link').click();
	await expect(installer.getByRole('heading', { name: 'Booking time' })).toBeVisible();
	// A backwards time is refused beside the field.
	await installer.getByLabel('Date').fill(made.newDay);
	await installer.getByLabel('Start').fill('16:00');
	await installer.getByLabel('End').fill('14:00');
	await installer.getByRole('button', { name: 'Propose this time' }).click();
	await expect(installer.getByLabel('End')).toHaveAttribute('aria-invalid', 'true');
	await installer.getByLabel('Start').fill('14:00');
	await installer.getByLabel('End').fill('16:00');
	await installer.getByLabel('Note (optional)').fill('A part arrives that morning.');
	await installer.getByRole('button', { name: 'Propose this time' }).click();
	const newSlot = {
		start: localToUtc(made.newDay, '14:00', ZONE),
		end: localToUtc(made.newDay, '16:00', ZONE)
	};
	const newLabel = formatSlotLabel(newSlot, ZONE);
	await expect(installer.getByTestId('proposed-slot')).toHaveText(newLabel);
	await expect(installer.getByRole('button', { name: 'Withdraw my proposal' })).toBeVisible();
	const proposedMail = await waitForMail(
		DEMO.owner,
		new RegExp(`New time proposed: ${made.title}`)
	);
	expect(proposedMail.text).toContain('A part arrives that morning.');

	// The owner's booking page points at the proposal; the owner accepts it.
	await owner.reload();
	await expect(owner.getByTestId('proposal-note')).toContainText(newLabel);
	await owner.getByTestId('proposal-note').getByRole('link', { name: 'Answer' }).click();
	await expect(owner.getByTestId('proposed-slot')).toHaveText(newLabel);
	await owner.getByRole('button', { name: 'Accept the new time' }).click();
	await expect(owner.getByTestId('booked-slot')).toHaveText(newLabel);
	await expect(owner.getByTestId('open-proposal')).toHaveCount(0);
	await waitForMail(DEMO.installer, new RegExp(`New time agreed: ${made.title}`));
	await owner.goto(bookingPath);
	await expect(owner.getByTestId('booked-slot')).toHaveText(newLabel);

	// The installer's job page and calendar show the new time.
	await installer.goto(`/installer/jobs/${made.jobId}`);
	await expect(installer.getByTestId('booked-slot')).toHaveText(newLabel);
	await installer.locator('a[href="/installer/calendar"]:visible').first().click();
	await expect(installer.getByRole('heading', { name: 'Calendar' })).toBeVisible();
	await installer.goto(`/installer/calendar?week=${made.newDay}`);
	const entry = installer.getByTestId('calendar-booking').filter({ hasText: made.title });
	await expect(entry).toContainText('2:00 pm – 4:00 pm');
	await expect(entry).toContainText('Walkerville');
	// Keyboard: the previous-week link is reachable and leads a week back.
	await installer.getByTestId('previous-week').focus();
	await installer.keyboard.press('Enter');
	await expect(installer).toHaveURL(/\?week=\d{4}-\d{2}-\d{2}$/);
	await expect(
		installer.getByTestId('calendar-booking').filter({ hasText: made.title })
	).toHaveCount(0);

	// The calendar file downloads with the new time and SEQUENCE 1.
	await installer.goto(`/installer/bookings/${bookingId}/time`);
	const [download] = await Promise.all([
		installer.waitForEvent('download'),
		installer.getByTestId('ics-link').click()
	]);
	const ics = await readFile((await download.path())!, 'utf8');
	expect(ics).toContain('BEGIN:VCALENDAR');
	expect(ics).toContain(`UID:booking-${bookingId}@tapline`);
	expect(ics).toContain('SEQUENCE:1');
	const utc = (d: Date) =>
		d
			.toISOString()
			.replace(/[-:]/g, '')
			.replace(/\.\d{3}/, '');
	expect(ics).toContain(`DTSTART:${utc(newSlot.start)}`);
	expect(ics).toMatch(/LOCATION:14 Demo Court/);

	// Someone else's calendar file is a 404.
	const ruthPage = await (await browser.newContext()).newPage();
	await signIn(ruthPage, 'ruth.akande@tapline.test');
	const refused = await ruthPage.request.get(`/installer/bookings/${bookingId}/booking.ics`);
	expect(refused.status()).toBe(404);
});

test('the calendar fits a phone and says when a week has nothing booked', async ({
	installerPage: page
}) => {
	await page.setViewportSize({ width: 375, height: 740 });
	await page.goto('/installer/calendar?week=2031-06-02');
	await expect(page.getByTestId('week-heading')).toContainText('2 Jun 2031');
	await expect(page.getByTestId('calendar-empty')).toBeVisible();
	await expect(page.getByTestId('calendar-day')).toHaveCount(7);
	const overflow = await page.evaluate(
		() => document.documentElement.scrollWidth - window.innerWidth
	);
	expect(overflow).toBe(0);
});

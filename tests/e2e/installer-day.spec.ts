import type { Page } from '@playwright/test';
import { formatDayTimeRange } from '../../src/lib/time';
import { DEMO, expect, signIn, test, waitForMail } from './fixtures';
import { closeQueries, postForm, query } from './support/requests';

// The demo installer's day: a job of the demo owner's that they have quoted, and one booked with
// them. Written straight into the tables (quoting and booking have their own tests), on copies of
// the demo hatch with titles of their own, so the marketplace test's job stays untouched.
const ZONE = 'Australia/Adelaide';
const RUTH = 'ruth.akande@tapline.test';
const DEMO_BUSINESS = 'Fuse & Fettle Auto Electrics';
const PHONE = { width: 360, height: 740 };

test.afterAll(closeQueries);

async function userId(email: string) {
	const [row] = await query<{ id: string }>(`SELECT id FROM "user" WHERE email = $1`, [email]);
	return row!.id;
}

/** A copy of the demo hatch under a new title, in the given status. */
async function copyHatch(title: string, status: 'collecting_quotes' | 'booked') {
	const [row] = await query<{ id: string }>(
		`INSERT INTO job (owner_id, status, draft_step, draft, request, scope, title, body_style,
			cameras, power, location_mode, suburb, postcode, latitude, longitude, address_line,
			time_zone, preferred_windows, price_low_cents, price_high_cents, submitted_at)
		 SELECT owner_id, $2, draft_step, draft, request, scope, $1, body_style, cameras, power,
			location_mode, suburb, postcode, latitude, longitude, address_line, time_zone,
			preferred_windows, price_low_cents, price_high_cents, now()
		 FROM job WHERE title = '2018 Demo Hatch' ORDER BY created_at LIMIT 1
		 RETURNING id`,
		[title, status]
	);
	return row!.id;
}

let made = 0;

/** Weeks ahead at 12:30 pm Adelaide time, clear of the times other tests book. */
function farSlot(days: number) {
	const start = new Date(Date.now() + days * 86_400_000);
	start.setUTCHours(2, 0, 0, 0);
	return { start, end: new Date(start.getTime() + 2 * 3_600_000) };
}

/** A quoted job and a booked one for the demo installer; their titles and the booked slot. */
async function demoInstallerDay() {
	const tag = Date.now().toString(36);
	const installer = await userId(DEMO.installer);
	const quotedTitle = `Quoted ute ${tag}`;
	const bookedTitle = `Booked wagon ${tag}`;
	const quoted = await copyHatch(quotedTitle, 'collecting_quotes');
	const booked = await copyHatch(bookedTitle, 'booked');
	const offered = [farSlot(44), farSlot(45)];
	await query(
		`INSERT INTO quote (job_id, installer_id, status, total_cents, slots, expires_at)
		 VALUES ($1, $2, 'live', 24500, $3, now() + interval '14 days')`,
		[quoted, installer, JSON.stringify(offered)]
	);
	// A day of its own for each booking this file makes (an installer's bookings may not overlap).
	const slot = farSlot(50 + made++);
	const [bookedQuote] = await query<{ id: string }>(
		`INSERT INTO quote (job_id, installer_id, status, total_cents, slots, expires_at)
		 VALUES ($1, $2, 'accepted', 26000, $3, now() + interval '14 days') RETURNING id`,
		[booked, installer, JSON.stringify([slot])]
	);
	await query(
		`INSERT INTO booking (job_id, quote_id, installer_id, owner_id, slot_start, slot_end, status,
			hold_expires_at, total_cents)
		 SELECT $1, $2, $3, owner_id, $4, $5, 'confirmed', now(), 26000 FROM job WHERE id = $1`,
		[booked, bookedQuote!.id, installer, slot.start, slot.end]
	);
	return { quoted, quotedTitle, bookedTitle, slot };
}

/** How far the page is wider than the phone (0 when it fits). */
async function overflow(page: Page) {
	return page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
}

test('the demo installer starts the day with fits, waiting quotes, new jobs and messages', async ({
	installerPage: page
}) => {
	const day = await demoInstallerDay();
	await page.goto('/installer');
	const fits = page.getByTestId('day-fits');
	const fit = fits.getByTestId('fit-row').filter({ hasText: day.bookedTitle });
	await expect(fit).toContainText('Walkerville');
	await expect(fit.getByTestId('fit-when')).toHaveText(
		formatDayTimeRange(day.slot.start, day.slot.end, ZONE)
	);
	await expect(fit).toContainText('Confirmed');
	const quote = page.getByTestId('waiting-quote').filter({ hasText: day.quotedTitle });
	await expect(quote).toContainText('$245.00');
	await expect(quote.getByRole('link', { name: day.quotedTitle })).toHaveAttribute(
		'href',
		`/installer/jobs/${day.quoted}`
	);
	// New jobs: a count with a link to the board, or the empty state with one.
	const newJobs = page.getByTestId('day-new-jobs');
	await expect(newJobs.getByRole('link', { name: /board/ }).first()).toBeVisible();
	await expect(page.getByTestId('day-messages')).toBeVisible();

	// The hours page lists the booked fit, and blocking its day is refused with the reason.
	await page.getByRole('link', { name: 'Working hours and days off' }).click();
	const booked = page.getByTestId('hours-booked');
	await expect(booked.getByTestId('fit-row').filter({ hasText: day.bookedTitle })).toBeVisible();
	const localDay = new Intl.DateTimeFormat('en-CA', { timeZone: ZONE }).format(day.slot.start);
	await page.getByLabel('Date').fill(localDay);
	await page.getByRole('button', { name: 'Block this date' }).click();
	await expect(
		page.getByRole('alert').filter({ hasText: 'You have a fit booked on' })
	).toBeVisible();
	await expect(page.getByLabel('Date')).toHaveAttribute('aria-invalid', 'true');
	await expect(page.getByText('Date blocked.')).toHaveCount(0);
});

test('an owner starts a message to an installer who quoted; one who did not is refused', async ({
	browser
}) => {
	const day = await demoInstallerDay();
	const ownerContext = await browser.newContext();
	const owner = await ownerContext.newPage();
	await signIn(owner, DEMO.owner);
	await owner.goto(`/owner/jobs/${day.quoted}/quotes`);
	await owner.getByRole('link', { name: `Message ${DEMO_BUSINESS}` }).click();
	await expect(owner).toHaveURL(/#questions$/);
	const thread = owner.locator('#questions');
	await expect(
		thread.getByRole('heading', { name: `Messages with ${DEMO_BUSINESS}` })
	).toBeVisible();
	await expect(thread.getByTestId('thread-empty')).toBeVisible();
	await thread.getByLabel('Message').fill('Could you start at 8 am? It is parked on the street.');
	await thread.getByRole('button', { name: 'Send', exact: true }).click();
	await expect(owner.getByTestId('thread')).toContainText('Could you start at 8 am?');
	const mail = await waitForMail(
		DEMO.installer,
		new RegExp(`The owner of the ${day.quotedTitle} wrote to you`)
	);
	expect(mail.text).toContain('Could you start at 8 am?');

	// An installer who did not quote: the thread page refuses, and so does a post to it.
	const ruth = await userId(RUTH);
	const refused = await owner.goto(`/owner/jobs/${day.quoted}/quotes/${ruth}`);
	expect(refused?.status()).toBe(403);
	await expect(owner.getByText('You can message the installers who have quoted')).toBeVisible();
	const posted = await postForm(owner.request, `/owner/jobs/${day.quoted}/quotes/${ruth}?/reply`, {
		body: 'Hello?'
	});
	expect(posted.status()).toBe(403);
	const written = await query(
		`SELECT id FROM job_message WHERE job_id = $1 AND installer_id = $2`,
		[day.quoted, ruth]
	);
	expect(written).toEqual([]);

	// The installer's day lists the thread as waiting for their answer.
	const installer = await browser.newPage();
	await signIn(installer, DEMO.installer);
	await installer.goto('/installer');
	const row = installer.getByTestId('thread-row').filter({ hasText: day.quotedTitle });
	await expect(row).toContainText('Waiting for your answer');
	await expect(row).toContainText('Could you start at 8 am?');
	await ownerContext.close();
});

test.describe('on a 360 px phone', () => {
	test.use({ viewport: PHONE });

	test('the day view, its lists and the owner’s message page fit without sideways scrolling', async ({
		page
	}) => {
		const day = await demoInstallerDay();
		await signIn(page, DEMO.installer);
		for (const path of [
			'/installer',
			'/installer/fits',
			'/installer/quotes',
			'/installer/messages',
			'/installer/hours'
		]) {
			await page.goto(path);
			expect(await overflow(page), path).toBeLessThanOrEqual(0);
		}
		// The whole list: the day view shows the first few, and the demo has fits of its own sooner.
		await page.goto('/installer/fits');
		await expect(page.getByTestId('fit-row').filter({ hasText: day.bookedTitle })).toBeVisible();
		await page.getByRole('button', { name: 'Sign out' }).click();
		await signIn(page, DEMO.owner);
		await page.goto(`/owner/jobs/${day.quoted}/quotes`);
		expect(await overflow(page), 'comparison').toBeLessThanOrEqual(0);
		await page.getByRole('link', { name: `Message ${DEMO_BUSINESS}` }).click();
		await expect(page.locator('#questions').getByLabel(/Message|Reply/)).toBeVisible();
		expect(await overflow(page)).toBeLessThanOrEqual(0);
	});
});

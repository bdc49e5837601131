import type { Browser } from '@playwright/test';
import { expect, test } from './fixtures';
import { closeQueries, newAccount, query } from './support/requests';
import { SAMPLE_REQUEST } from '../../seed/sample-request';

test.afterAll(closeQueries);

// A town far from every demo installer's circle, so these jobs reach only this test's installers.
const FAR = { lat: -37.8284, lng: 140.7804, suburb: 'Mount Gambier', postcode: '5290' };

/** A new installer account, vetted and quoting, based at FAR. */
async function vettedInstaller(browser: Browser, label: string) {
	const account = await newAccount(browser, 'installer', label);
	await query(
		`insert into installer_profile (user_id, business_name, suburb, postcode, latitude, longitude,
			service_radius_km, skills, offers_mobile, offers_workshop, vetting_status, submitted_at,
			payouts_enabled)
		values ($1, $2, $3, $4, $5, $6, 25,
			array['parking-mode','tailgate-rear','vans-utes','obd-power','cabin-camera'],
			true, true, 'approved', now(), true)`,
		[
			account.id,
			`${label} Fitting ${Date.now().toString(36)}`,
			FAR.suburb,
			FAR.postcode,
			FAR.lat,
			FAR.lng
		]
	);
	return account;
}

/**
 * A job of a new owner for an invented car, at FAR, with the request and scope sheet of the demo's
 * hatchback (same body style, cameras and power) and the car's make, model and year changed.
 */
async function jobFor(browser: Browser, car: { make: string; model: string; year: string }) {
	const owner = await newAccount(browser, 'owner', 'fit-note-owner');
	const title = `${car.year} ${car.make} ${car.model}`;
	const [row] = await query<{ id: string }>(
		`insert into job (owner_id, status, draft_step, draft, request, scope, title, body_style,
			cameras, power, required_skills, scope_summary, price_low_cents, price_high_cents,
			location_mode, suburb, postcode, latitude, longitude, preferred_windows, submitted_at)
		select $1, 'collecting_quotes', 'review', d.request || $2::jsonb, d.request || $2::jsonb,
			d.scope, $3, d.body_style, d.cameras, d.power, d.required_skills, d.scope_summary,
			d.price_low_cents, d.price_high_cents, 'mobile', $4, $5, $6, $7, d.preferred_windows, now()
		from job d where d.title = '2018 Demo Hatch' and d.body_style = 'hatchback' limit 1
		returning id`,
		[owner.id, JSON.stringify(car), title, FAR.suburb, FAR.postcode, FAR.lat, FAR.lng]
	);
	if (!row) throw new Error('the demo hatchback job is missing');
	return { jobId: row.id, owner, title };
}

/** Books the job with the installer, at the reported stage, with a fit report of `minutes`. */
async function reportedFit(jobId: string, ownerId: string, installerId: string, minutes: number) {
	const [row] = await query<{ id: string }>(
		`with q as (insert into quote (job_id, installer_id, status, total_cents)
			values ($1, $3, 'accepted', 32000) returning id),
		j as (update job set status = 'booked' where id = $1),
		b as (insert into booking (job_id, quote_id, installer_id, owner_id, slot_start, slot_end,
			status, hold_expires_at, total_cents, stage, reported_at)
			select $1, q.id, $3, $2, now() - interval '1 day', now() - interval '22 hours',
				'confirmed', now() - interval '2 days', 32000, 'reported', now() from q
			returning id)
		insert into fit_report (booking_id, installer_id, minutes_taken, details)
		select b.id, $3, $4, '{}'::jsonb from b returning booking_id as id`,
		[jobId, ownerId, installerId, minutes]
	);
	return row!.id;
}

test('an installer publishes a fit note; a second vetted installer sees it beside a matching job', async ({
	page,
	browser
}) => {
	const stamp = Date.now().toString(36);
	const model = `Aster ${stamp}`;
	const author = await vettedInstaller(browser, 'note-author');
	const fitted = await jobFor(browser, { make: 'Corvan', model, year: '2017' });
	await reportedFit(fitted.jobId, fitted.owner.id, author.id, 105);

	// The author opens the reported fit's job and publishes a note from it.
	const authorPage = await author.context.newPage();
	await authorPage.goto(`/installer/jobs/${fitted.jobId}`);
	await authorPage.getByTestId('publish-fit-note').click();
	await expect(authorPage.getByRole('heading', { name: 'Publish a fit note' })).toBeVisible();
	await expect(authorPage.getByLabel('Make', { exact: true })).toHaveValue('Corvan');
	await expect(authorPage.getByLabel('Model', { exact: true })).toHaveValue(model);
	await authorPage.getByLabel('From model year').fill('2015');
	await authorPage.getByLabel('To model year').fill('2019');
	await authorPage.getByLabel('Where the fuse box is').fill('Behind the glovebox, left side');
	await authorPage.getByLabel('How it opens').fill('Squeeze both glovebox stops, let it drop');
	await authorPage.getByLabel('Switched supply: fuse position').fill('F23 accessory socket');
	await authorPage.getByLabel('Its rating (A)').first().fill('15');
	await authorPage.getByLabel('Permanent supply: fuse position').fill('F7 interior light');
	await authorPage.getByLabel('Its rating (A)').nth(1).fill('10');
	await authorPage.getByLabel('Ground points that worked').fill('A-pillar base body bolt');
	await authorPage.getByLabel('Trim that comes off, and how').fill('A-pillar cover, top first');
	await authorPage
		.getByLabel('Pitfalls', { exact: true })
		.fill('F7 stays live about 10 minutes after locking');
	// A phone number is refused, not stored.
	await authorPage.getByLabel('Grommet route for a rear cable').fill('Ring me on 0412 345 678');
	await authorPage.getByRole('button', { name: 'Publish the note' }).click();
	await expect(authorPage.getByText(/Leave out phone numbers/)).toBeVisible();
	await authorPage.getByLabel('Grommet route for a rear cable').fill('Left tailgate grommet');
	await authorPage.getByRole('button', { name: 'Publish the note' }).click();
	await expect(authorPage.getByText(/^Published\./)).toBeVisible();
	await expect(
		authorPage.getByRole('heading', { name: `Corvan ${model}, 2015–2019` })
	).toBeVisible();
	await expect(authorPage.getByTestId('note-standing')).toHaveText(
		'Not yet confirmed on another fit'
	);
	const notes = await query<{ grommet_route: string }>(
		`select grommet_route from fit_note where model = $1`,
		[model]
	);
	expect(notes).toEqual([{ grommet_route: 'Left tailgate grommet' }]);
	await author.context.close();

	// A second vetted installer views a matching open job (a 2017 of the same model, typed in
	// lower case by its owner) and finds the note beside it.
	const reader = await vettedInstaller(browser, 'note-reader');
	const open = await jobFor(browser, { make: 'corvan', model: model.toLowerCase(), year: '2017' });
	const readerPage = await reader.context.newPage();
	await readerPage.goto(`/installer/jobs/${open.jobId}`);
	const beside = readerPage.getByTestId('job-fit-notes');
	await expect(beside.getByTestId('fit-note-row')).toHaveCount(1);
	await beside.getByRole('link', { name: `Corvan ${model}, 2015–2019` }).click();
	await expect(readerPage.getByTestId('note-switched')).toHaveText('F23 accessory socket (15 A)');
	await readerPage.getByLabel('Confirmed on my fit').check();
	await readerPage.getByLabel('What you found').fill('F23 held on mine too');
	await readerPage.getByRole('button', { name: 'Add my mark' }).click();
	await expect(readerPage.getByTestId('note-standing')).toHaveText('Confirmed on 1 other fit');
	await expect(readerPage.getByText('You have marked this note.')).toBeVisible();

	// The search finds it through a typo and a year inside the range.
	await readerPage.goto(
		`/installer/fit-notes?q=${encodeURIComponent(`corvin ${model}`)}&year=2018`
	);
	await expect(readerPage.getByTestId('fit-note-row')).toHaveCount(1);
	await reader.context.close();

	// Owners never reach fit notes; nor does an installer who is not vetted.
	const ownerRes = await open.owner.request.get('/installer/fit-notes', { maxRedirects: 0 });
	expect(ownerRes.status()).toBe(403);
	const unvetted = await newAccount(browser, 'installer', 'note-unvetted');
	const unvettedRes = await unvetted.request.get('/installer/fit-notes', { maxRedirects: 0 });
	expect(unvettedRes.status()).toBe(403);
	expect(await unvettedRes.text()).toContain('vetted installers in good standing');
	for (const account of [unvetted, open.owner, fitted.owner]) await account.context.close();
	await page.close();
});

// A kind of job no other spec posts, so the fits written here calibrate no other spec's sheet.
const RARE = { bodyStyle: 'people-mover', cameras: 'front', power: 'battery-pack' } as const;

test("the owner's review step counts fits of the body style and the sheet says what it rests on", async ({
	browser
}) => {
	const installer = await vettedInstaller(browser, 'calibration-fitter');
	const fitOwner = await newAccount(browser, 'owner', 'calibration-fit-owner');
	// Three reported fits of the same kind of job, a day apart (the installer's slots must not overlap).
	for (const [i, minutes] of [55, 60, 65].entries()) {
		await query(
			`with j as (insert into job (owner_id, status, title, body_style, cameras, power)
				values ($1, 'booked', 'Earlier fit', $3, $4, $5) returning id),
			q as (insert into quote (job_id, installer_id, status, total_cents)
				select j.id, $2, 'accepted', 20000 from j returning id, job_id),
			b as (insert into booking (job_id, quote_id, installer_id, owner_id, slot_start, slot_end,
				status, hold_expires_at, total_cents, stage, reported_at)
				select q.job_id, q.id, $2, $1, now() - make_interval(days => $6 + 3),
					now() - make_interval(days => $6 + 3) + interval '1 hour', 'confirmed',
					now() - interval '30 days', 20000, 'reported', now() from q returning id)
			insert into fit_report (booking_id, installer_id, minutes_taken, details, filed_at)
			select b.id, $2, $7, '{}'::jsonb, now() - make_interval(days => $6 + 2) from b`,
			[fitOwner.id, installer.id, RARE.bodyStyle, RARE.cameras, RARE.power, i, minutes]
		);
	}
	const owner = await newAccount(browser, 'owner', 'calibration-owner');
	const draft = { ...SAMPLE_REQUEST, ...RARE, make: 'Corvan', model: 'Tessel', year: '2020' };
	const [job] = await query<{ id: string }>(
		`insert into job (owner_id, status, draft_step, draft, title, location_mode, suburb, postcode,
			latitude, longitude, preferred_windows)
		values ($1, 'drafting', 'review', $2::jsonb, '2020 Corvan Tessel', 'workshop', $3, $4, $5, $6,
			jsonb_build_array(jsonb_build_object('date', to_char(now() + interval '9 days', 'YYYY-MM-DD'),
				'window', 'morning')))
		returning id`,
		[owner.id, JSON.stringify(draft), FAR.suburb, FAR.postcode, FAR.lat, FAR.lng]
	);
	const page = await owner.context.newPage();
	await page.goto(`/owner/jobs/${job!.id}/review`);
	await expect(page.getByTestId('body-style-fits')).toContainText(
		/reported \d+ fits of this body style \(people mover\) in the last year/
	);
	// The owner reads a count only: no installer's note or name.
	await expect(page.getByTestId('body-style-fits')).not.toContainText('Fitting');
	await expect(page.getByTestId('labour-calibration')).toContainText(/Total based on \d+ fits/);
	for (const account of [installer, fitOwner, owner]) await account.context.close();
});

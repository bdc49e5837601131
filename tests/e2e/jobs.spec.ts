import sharp from 'sharp';
import { formatDay } from '../../src/lib/time';
import { expect, test } from './fixtures';

const inDays = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10);

test('an owner posts a front + rear parking-mode job with a photo and reads the scope sheet', async ({
	ownerPage: page
}, testInfo) => {
	await page.getByRole('button', { name: 'Describe a new job' }).click();
	await expect(page.getByRole('heading', { name: 'The vehicle' })).toBeVisible();

	await page.getByLabel('Make').fill('Demo');
	await page.getByLabel('Model').fill('Tourer');
	await page.getByLabel('Year').fill('2019');
	await page.getByLabel('Body style').selectOption('wagon');
	await page.getByText('Mini blade').click();
	await page.getByLabel('Battery type').selectOption('agm');
	await page.getByLabel('Battery capacity, Ah (if known)').fill('70');
	await page.getByText('The engine stops by itself').click();
	await page.getByRole('radio', { name: 'Yes' }).check();
	await page.getByRole('button', { name: 'Save and continue' }).click();

	await expect(page.getByRole('heading', { name: 'The cameras' })).toBeVisible();
	await page.getByText('Front and rear', { exact: true }).click();
	await page.getByText('I already have the camera').click();
	await page.getByRole('button', { name: 'Save and continue' }).click();

	await expect(page.getByRole('heading', { name: 'Power' })).toBeVisible();
	await page.getByText('Hard-wired with parking mode').click();
	// A reading no rested battery gives is refused with a reason; a real one is kept.
	const restVolts = page.getByLabel('Battery rest voltage you measured, V (optional)');
	await restVolts.fill('15');
	await page.getByRole('button', { name: 'Save and continue' }).click();
	await expect(page.getByText(/above that is a charger or a running engine/)).toBeVisible();
	await restVolts.fill('12.45');
	await page.getByRole('button', { name: 'Save and continue' }).click();

	await expect(page.getByRole('heading', { name: 'Where and when' })).toBeVisible();
	await page.getByText("At the installer's workshop").click();
	await page.getByLabel('Suburb or postcode').fill('Norwood');
	await page.getByRole('button', { name: 'Show on map' }).click();
	await expect(page.getByTestId('map-picker-point')).toContainText('-34.92');
	await page.getByLabel('Choice 1: date').fill(inDays(5));
	await page.getByRole('button', { name: 'Save and continue' }).click();

	await expect(page.getByRole('heading', { name: 'Photos (optional)' })).toBeVisible();
	const photo = await sharp({
		create: { width: 800, height: 600, channels: 3, background: '#334455' }
	})
		.jpeg()
		.toBuffer();
	const fuseBox = page.getByTestId('photo-fuse-box');
	await fuseBox
		.locator('input[type=file]')
		.setInputFiles({ name: 'fuses.jpg', mimeType: 'image/jpeg', buffer: photo });
	await fuseBox.getByRole('button', { name: 'Upload photo' }).click();
	await expect(fuseBox.getByRole('img')).toBeVisible();
	await expect(fuseBox.getByRole('button', { name: 'Replace photo' })).toBeVisible();

	// A file that only claims to be a photo is refused with a reason.
	const rear = page.getByTestId('photo-rear-window');
	await rear.locator('input[type=file]').setInputFiles({
		name: 'rear.jpg',
		mimeType: 'image/jpeg',
		buffer: Buffer.from('%PDF-1.4 not a photo')
	});
	await rear.getByRole('button', { name: 'Upload photo' }).click();
	await expect(rear.getByRole('alert')).toContainText('not one we accept');

	await page.getByRole('button', { name: 'Continue to review' }).click();
	await expect(page.getByRole('heading', { name: 'Review your scope sheet' })).toBeVisible();
	// What the owner entered sits above the sheet, each part with a way back to change it.
	const entered = page.getByTestId('entered-details');
	await expect(entered.getByTestId('entered-vehicle')).toContainText('2019');
	await expect(entered.getByTestId('entered-vehicle')).toContainText('Tourer');
	await expect(entered.getByTestId('entered-dates')).toContainText(formatDay(inDays(5)));
	await expect(entered.getByTestId('entered-photos').getByRole('img')).not.toHaveCount(0);
	await expect(entered.getByRole('link', { name: 'Change Power' })).toHaveAttribute(
		'href',
		'./power'
	);
	const sheet = page.getByTestId('scope-sheet');
	await expect(sheet.getByRole('heading', { name: 'Labour' })).toBeVisible();
	await expect(sheet.getByText(/2 × Fuse tap, mini blade/i)).toBeVisible();
	await expect(sheet.getByTestId('parking-hours')).toContainText('hours');
	// The sheet says what the estimate rests on: the measured start, the setup's draw, the car's
	// own draw, the (partly derived) AGM table and the loaded-voltage caveat.
	const assumptions = sheet.getByTestId('parking-assumptions');
	await expect(assumptions).toContainText('from the 12.45 V you measured at rest');
	await expect(assumptions).toContainText('500 mA for front and rear cameras');
	await expect(assumptions).toContainText("The car's own standby draw: 50 mA");
	await expect(assumptions).toContainText('derived by Tapline');
	await expect(assumptions).toContainText('below the resting voltage');
	await expect(sheet.getByText(/airbag/i).first()).toBeVisible();
	// The sentence on local rules is said once, above the list of cautions.
	await expect(sheet.getByText(/local road rules/)).toHaveCount(1);
	await expect(sheet.getByTestId('cautions-rule')).toContainText('local road rules');
	await expect(sheet.getByTestId('price-range')).toContainText('$');

	await page.screenshot({ path: testInfo.outputPath('review.png'), fullPage: true });
	await page.getByRole('button', { name: 'Post this job for quotes' }).click();
	await expect(page.getByTestId('job-status')).toHaveText('Open for quotes');
	await expect(page.getByRole('heading', { name: '2019 Demo Tourer' })).toBeVisible();
	await expect(page.getByTestId('scope-sheet')).toBeVisible();
	await expect(page.getByRole('img', { name: /fuse box/i })).toBeVisible();

	await page.getByRole('link', { name: '← My jobs' }).click();
	const row = page.getByTestId('my-jobs').getByRole('row', { name: /2019 Demo Tourer/ });
	await expect(row).toContainText('Open for quotes');
	// The first preferred date, in the one date style people read ('Mon 7 Dec').
	await expect(row).toContainText(formatDay(inDays(5)));

	// My jobs sorts from its headers: newest started first, then the other way round.
	const started = page.getByTestId('my-jobs').getByRole('columnheader', { name: 'Started' });
	await expect(started).toHaveAttribute('aria-sort', 'descending');
	await started.getByRole('link').click();
	await expect(page).toHaveURL(/\?sort=created&dir=asc$/);
	await expect(started).toHaveAttribute('aria-sort', 'ascending');
});

test('a step refuses bad input with messages, and another owner cannot open the job', async ({
	ownerPage: page,
	browser
}) => {
	await page.getByRole('button', { name: 'Describe a new job' }).click();
	await page.getByLabel('Year').fill('99');
	await page.getByRole('button', { name: 'Save and continue' }).click();
	await expect(page.getByText('Enter the make')).toBeVisible();
	await expect(page.getByText('Enter a year from 1900 to 2099, e.g. 2018')).toBeVisible();
	await expect(page.getByText('Choose a body style')).toBeVisible();
	// A select with nothing valid chosen reads "Choose…" after the refusal and is marked invalid.
	const bodyStyle = page.getByLabel('Body style');
	const battery = page.getByLabel('Battery type');
	await expect(bodyStyle.locator('option:checked')).toHaveText('Choose…');
	await expect(bodyStyle).toHaveAttribute('aria-invalid', 'true');
	await expect(bodyStyle).toHaveAccessibleDescription('Choose a body style');
	await expect(battery.locator('option:checked')).toHaveText('Choose…');
	await expect(battery).toHaveAttribute('aria-invalid', 'true');
	// A choice made before the next refusal stays chosen and stops being invalid.
	await bodyStyle.selectOption('ute');
	await page.getByRole('button', { name: 'Save and continue' }).click();
	await expect(bodyStyle).not.toHaveAttribute('aria-invalid');
	await expect(bodyStyle.locator('option:checked')).toHaveText('Ute');
	await expect(battery.locator('option:checked')).toHaveText('Choose…');
	await expect(battery).toHaveAttribute('aria-invalid', 'true');
	const jobUrl = page.url().replace(/\/vehicle$/, '');

	const other = await browser.newPage();
	await other.goto('/sign-in');
	await other.getByLabel('E-mail').fill('tobias.wren@tapline.test');
	await other.getByLabel('Password').fill('tapline-demo-2026');
	await other.getByRole('button', { name: 'Sign in' }).click();
	await expect(other).toHaveURL(/\/owner$/);
	const res = await other.goto(jobUrl);
	expect(res?.status()).toBe(404);
	await other.close();
});

test('withdrawing asks for a reason and a confirmation', async ({ ownerPage: page }) => {
	await page.getByRole('button', { name: 'Describe a new job' }).click();
	const jobUrl = page.url().replace(/\/vehicle$/, '');
	await page.goto(jobUrl);
	await page.getByText('Withdraw…').click();
	await page.getByRole('button', { name: 'Withdraw the job' }).click();
	await expect(page.getByText('Tick the box to confirm')).toBeVisible();
	await page.getByLabel('Reason (installers who quoted see it)').fill('Changed my mind');
	await page.getByText('Yes, withdraw it.').click();
	await page.getByRole('button', { name: 'Withdraw the job' }).click();
	await expect(page.getByTestId('job-status')).toHaveText('Withdrawn');
	await expect(page.getByText('Withdrawn: Changed my mind')).toBeVisible();
});

test('an oversized photo is refused with its size and the limit, and nothing is stored', async ({
	ownerPage: page
}) => {
	await page.getByRole('button', { name: 'Describe a new job' }).click();
	await page.waitForURL(/\/vehicle$/);
	await page.goto(page.url().replace(/vehicle$/, 'photos'));
	// 11 MiB that starts like a JPEG: refused on size before anything is decoded.
	const big = Buffer.alloc(11 * 1024 * 1024, 0);
	big.set([0xff, 0xd8, 0xff, 0xe0]);
	const windscreen = page.getByTestId('photo-windscreen');
	await windscreen
		.locator('input[type=file]')
		.setInputFiles({ name: 'huge.jpg', mimeType: 'image/jpeg', buffer: big });
	await windscreen.getByRole('button', { name: 'Upload photo' }).click();
	await expect(windscreen.getByRole('alert')).toHaveText(
		'The file is 11.0 MB; the limit is 10 MB.'
	);
	await page.reload();
	await expect(page.getByTestId('photo-windscreen').getByRole('img')).toHaveCount(0);
});

import { expect, test } from '@playwright/test';
import { jpegPhoto } from './fixtures';
import { paidBooking } from './support/fit-booking';
import { closeQueries } from './support/requests';

test.afterAll(closeQueries);

// Runs in the `no-javascript` project: the fit report is a plain multipart post.
test('the fit report works without JavaScript: refusals come back from the server, then it files', async ({
	browser
}) => {
	test.setTimeout(120_000);
	const { bookingId, phone } = await paidBooking(browser, 'fit-nojs', false);
	await phone.goto(`/installer/bookings/${bookingId}/report`);
	const item = (name: string) => phone.getByTestId(`item-${name}`);
	// Without JavaScript every detail and reason field shows; the server says what is missing.
	await expect(item('ground').getByLabel('Why it does not apply', { exact: true })).toBeVisible();
	await phone.getByRole('button', { name: 'File the fit report' }).click();
	await expect(item('cameraPlacement')).toContainText(
		'Tick this, or mark it "does not apply" and say why'
	);
	await expect(phone.getByText('Enter the minutes on the vehicle')).toBeVisible();

	await item('switchedTap')
		.getByRole('radio', { name: /^Tapped/ })
		.check();
	await item('switchedTap').getByLabel('Fuse position', { exact: true }).fill('F7 cabin box');
	await item('switchedTap').getByLabel('Original fuse', { exact: true }).selectOption('7.5');
	await item('switchedTap').getByLabel('Added circuit fuse', { exact: true }).selectOption('3');
	for (const name of ['permanentTap', 'cutOff', 'parkingMode']) {
		await item(name)
			.getByRole('radio', { name: /^Does not apply/ })
			.check();
		await item(name)
			.getByLabel('Why it does not apply', { exact: true })
			.fill('Switched supply only');
	}
	await item('tapOrientation')
		.getByRole('radio', { name: /^Checked/ })
		.check();
	await item('ground')
		.getByRole('radio', { name: /^Grounded/ })
		.check();
	await item('ground').getByLabel('Ground point', { exact: true }).fill('Dash frame bolt');
	await item('ground')
		.getByRole('checkbox', { name: /^On bare metal/ })
		.check();
	for (const name of ['cableHidden', 'airbagRouting', 'cameraPlacement', 'rearDemister']) {
		await item(name)
			.getByRole('radio', { name: /^Checked/ })
			.check();
	}
	await phone.getByLabel('Minutes on the vehicle').fill('60');
	await phone.getByLabel('Photos').setInputFiles({
		name: 'camera.jpg',
		mimeType: 'image/jpeg',
		buffer: await jpegPhoto()
	});
	await phone.getByRole('button', { name: 'File the fit report' }).click();
	await expect(phone).toHaveURL(new RegExp(`/installer/bookings/${bookingId}/record$`));
	const record = phone.getByTestId('install-record');
	await expect(record).toContainText(
		'Fuse F7 cabin box: original 7.5 A, added circuit 3 A (mini blade)'
	);
	await expect(record).toContainText('Does not apply: Switched supply only');
	await expect(record).toContainText('Dash frame bolt, on bare metal');
});

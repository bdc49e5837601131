import { DEMO, expect, signIn, test } from './fixtures';

test('an admin changes the fee with a reason, sees it in the audit, and an owner is refused', async ({
	page,
	browser
}) => {
	await signIn(page, DEMO.admin);
	await page.getByRole('link', { name: 'Settings' }).first().click();
	await expect(page.getByRole('heading', { name: 'Market settings' })).toBeVisible();
	const fee = page.getByLabel("Tapline's fee (% of the booking total, incl. GST)");
	const before = await fee.inputValue();
	// Out of bounds and without a reason: both refused, nothing saved.
	await fee.fill('45');
	await page.getByRole('button', { name: 'Save the settings' }).click();
	await expect(page.getByText('Keep the fee at 30 % or less')).toBeVisible();
	await expect(page.getByText('Say why, in a few words')).toBeVisible();
	await fee.fill('12.5');
	await page.getByLabel('Reason (kept in the audit trail)').fill('Trial of a new fee');
	await page.getByRole('button', { name: 'Save the settings' }).click();
	await expect(page.getByText(/Saved: 1 setting changed/)).toBeVisible();
	await expect(page.getByTestId('settings-changes')).toContainText('Trial of a new fee');
	await expect(page.getByTestId('settings-changes')).toContainText(`${before} % → 12.5 %`);
	// The next quote's fee line uses it: an installer opening a job to quote sees 12.5 %.
	const installer = await browser.newPage();
	await signIn(installer, DEMO.installer);
	await installer.goto('/installer/jobs');
	await installer.getByTestId('job-row').first().getByRole('link').first().click();
	await expect(installer.getByTestId('quote-fee-rule')).toContainText(
		'12.5 % of the total, at least $'
	);
	// Back to where it was, so other journeys see the starting fee.
	await fee.fill(before);
	await page.getByLabel('Reason (kept in the audit trail)').fill('End of the trial');
	await page.getByRole('button', { name: 'Save the settings' }).click();
	await expect(page.getByTestId('settings-changes')).toContainText('End of the trial');

	const owner = await browser.newPage();
	await signIn(owner, DEMO.owner);
	const res = await owner.goto('/admin/settings');
	expect(res?.status()).toBe(403);
});

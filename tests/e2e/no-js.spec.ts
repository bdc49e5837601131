import { expect, test } from '@playwright/test';
import { newAccount } from './support/requests';

// Runs in the `no-javascript` project: the forms must work as plain HTML posts.
test('sign-in without JavaScript: errors come back from the server, success signs in', async ({
	page
}) => {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill('nonsense');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByText('That does not look like an e-mail address')).toBeVisible();
	await expect(page.getByText('Enter your password')).toBeVisible();

	await page.getByLabel('E-mail').fill('demo.installer@tapline.test');
	await page.getByLabel('Password').fill('tapline-demo-2026');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page).toHaveURL(/\/installer$/);
	await expect(page.getByRole('heading', { name: 'My work' })).toBeVisible();
});

test('sign-up without JavaScript keeps what was typed when it refuses', async ({ page }) => {
	await page.goto('/sign-up');
	await page.getByLabel('Your name').fill('Nola Brisk');
	await page.getByLabel('E-mail').fill('nola@example');
	await page.getByLabel('Password').fill('tiny');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page.getByText('Use at least 10 characters')).toBeVisible();
	await expect(page.getByLabel('Your name')).toHaveValue('Nola Brisk');
	await expect(page.getByLabel('Password')).toHaveValue('');
});

test('the first job step works without JavaScript', async ({ page }) => {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill('leilani.fox@tapline.test');
	await page.getByLabel('Password').fill('tapline-demo-2026');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await page.getByRole('button', { name: 'Describe a new job' }).click();
	await page.getByRole('button', { name: 'Save and continue' }).click();
	await expect(page.getByText('Enter the make')).toBeVisible();
	// The server's page after the refusal: the empty select reads "Choose…" and is marked invalid.
	const bodyStyle = page.getByLabel('Body style');
	await expect(bodyStyle.locator('option:checked')).toHaveText('Choose…');
	await expect(bodyStyle).toHaveAttribute('aria-invalid', 'true');
	await expect(bodyStyle).toHaveAccessibleDescription('Choose a body style');
	await page.getByLabel('Make').fill('Demo');
	await page.getByLabel('Model').fill('Ute');
	await page.getByLabel('Year').fill('2021');
	await page.getByLabel('Body style').selectOption('ute');
	await page.getByText('Not sure', { exact: true }).first().click();
	await page.getByLabel('Battery type').selectOption('unknown');
	await page.getByRole('radio', { name: 'No', exact: true }).check();
	await page.getByRole('button', { name: 'Save and continue' }).click();
	await expect(page.getByRole('heading', { name: 'The cameras' })).toBeVisible();
});

test('the account page works without JavaScript: refusals and changes come from the server', async ({
	browser,
	page
}) => {
	const me = await newAccount(browser, 'installer', 'account-no-js');
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill(me.email);
	await page.getByLabel('Password').fill('long enough passphrase');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await page.goto('/account');
	await page.getByLabel('Name', { exact: true }).fill('');
	await page.getByRole('button', { name: 'Save the name' }).click();
	await expect(page.getByText('Tell us your name (at least 2 characters)')).toBeVisible();
	await page.getByLabel('Name', { exact: true }).fill('Kit Marlow');
	await page.getByRole('button', { name: 'Save the name' }).click();
	await expect(page.getByText('Your name is now Kit Marlow.')).toBeVisible();

	const closeForm = page.locator('form[action="?/closeAccount"]');
	await closeForm.getByLabel('Current password').fill('long enough passphrase');
	await closeForm.getByRole('button', { name: 'Close my account' }).click();
	await expect(page.getByText('Tick the box to say you understand').first()).toBeVisible();
	await page
		.locator('form[action="?/closeAccount"]')
		.getByLabel('Current password')
		.fill('long enough passphrase');
	await page.getByLabel('I understand that closing cannot be undone').check();
	await page.getByRole('button', { name: 'Close my account' }).click();
	await expect(
		page.getByText('Your account is closed and every device is signed out.')
	).toBeVisible();
	await expect(page.getByRole('link', { name: 'Sign in' })).toBeVisible();
	await me.context.close();
});

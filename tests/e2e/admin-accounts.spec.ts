import { expect, signIn, test } from './fixtures';
import { closeQueries, newAccount } from './support/requests';

test.afterAll(closeQueries);

test('an admin finds an account, suspends it with a reason, and it cannot sign in until reinstated', async ({
	adminPage: page,
	browser
}) => {
	const owner = await newAccount(browser, 'owner', 'suspendme');
	await page.getByRole('link', { name: 'Accounts' }).first().click();
	await expect(page.getByRole('heading', { name: 'Accounts' })).toBeVisible();
	await page.getByLabel('Name or e-mail').fill(owner.email);
	await page.getByRole('button', { name: 'Find' }).click();
	await expect(page.getByTestId('users-count')).toContainText('1 account');
	await page.getByTestId('user-row').getByRole('link').click();

	// The reason and the confirmation are both required.
	await page.getByText('Suspend the account…').click();
	const form = page.getByRole('region', { name: 'Suspend the account' });
	await form.getByRole('button', { name: 'Suspend the account' }).click();
	await expect(form.getByLabel('Reason (kept in the audit trail)')).toHaveAttribute(
		'aria-invalid',
		'true'
	);
	await form.getByLabel('Reason (kept in the audit trail)').fill('Posted a job with abuse in it');
	await form.getByLabel('Yes, do it.').check();
	await form.getByRole('button', { name: 'Suspend the account' }).click();
	await expect(page.getByTestId('suspended')).toContainText('Posted a job with abuse in it');
	await expect(page.getByTestId('audit-trail')).toContainText('Suspended the account');

	// Their session ended; signing in again is refused with a clear message.
	const res = await owner.request.get('/owner', { maxRedirects: 0 });
	expect(res.status()).toBe(303);
	const other = await browser.newPage();
	await other.goto('/sign-in');
	await other.getByLabel('E-mail').fill(owner.email);
	await other.getByLabel('Password').fill('long enough passphrase');
	await other.getByRole('button', { name: 'Sign in' }).click();
	await expect(other.getByRole('alert')).toContainText('This account is suspended');

	await page.getByText('Lift the suspension…').click();
	const lift = page.getByRole('region', { name: 'Lift the suspension' });
	await lift.getByLabel('Reason (kept in the audit trail)').fill('Spoke with them, resolved');
	await lift.getByLabel('Yes, do it.').check();
	await lift.getByRole('button', { name: 'Lift the suspension' }).click();
	await expect(page.getByTestId('suspended')).toHaveCount(0);
	await expect(page.getByTestId('audit-trail')).toContainText('Lifted the suspension');
	await signIn(other, owner.email, 'long enough passphrase');
	await expect(other).toHaveURL(/\/owner/);
});

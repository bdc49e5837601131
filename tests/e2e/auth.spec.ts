import { BASE_URL, newAccount, postForm } from './support/requests';
import { expect, linkIn, signIn, test, uniqueEmail, waitForMail } from './fixtures';

test('an owner signs up, confirms the e-mail through the inbox, signs out and back in', async ({
	page
}) => {
	const email = uniqueEmail('owner');
	const password = 'long enough passphrase';
	await page.goto('/sign-up');
	await page.getByText('A car owner').click();
	await page.getByLabel('Your name').fill('Ada Quill');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill(password);
	await page.getByRole('button', { name: 'Create account' }).click();

	await expect(page).toHaveURL(/\/verify-email\?sent=1/);
	await expect(page.getByText('Check your inbox')).toBeVisible();
	// Sign-up starts no session (a taken address must get the same answer); the link does.
	await expect(page.getByRole('button', { name: 'Sign out' })).toHaveCount(0);

	const mail = await waitForMail(email, /Confirm your e-mail/);
	expect(mail.html).toContain('Confirm my address');
	await page.goto(linkIn(mail, '/verify-email?token='));
	await page.getByRole('button', { name: 'Confirm my address' }).click();
	await expect(page.getByText('Your e-mail address is confirmed')).toBeVisible();
	await expect(page.getByText('Please confirm your e-mail address')).toHaveCount(0);
	// The way on leads to the owner's own page, not back to the landing page.
	await page.getByRole('link', { name: 'Continue to My jobs' }).click();
	await expect(page).toHaveURL(/\/owner$/);

	await page.getByRole('button', { name: 'Sign out' }).click();
	await expect(page.getByRole('link', { name: 'Sign in' })).toBeVisible();

	await signIn(page, email, password);
	await expect(page).toHaveURL(/\/owner$/);
	await expect(page.getByRole('heading', { name: 'My jobs' })).toBeVisible();
});

test('sign-up refuses bad input with clear messages', async ({ page }) => {
	await page.goto('/sign-up');
	await page.getByLabel('Your name').fill('A');
	await page.getByLabel('E-mail').fill('not-an-address');
	await page.getByLabel('Password').fill('short');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page.getByText('Tell us your name (at least 2 characters)')).toBeVisible();
	await expect(page.getByText('That does not look like an e-mail address')).toBeVisible();
	await expect(page.getByText('Use at least 10 characters')).toBeVisible();
	await expect(page.getByLabel('Password')).toHaveAttribute('aria-invalid', 'true');
});

test('a wrong password gets one plain message', async ({ page }) => {
	await page.goto('/sign-in');
	await page.getByLabel('E-mail').fill('demo.owner@tapline.test');
	await page.getByLabel('Password').fill('not the password');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page.getByRole('alert')).toContainText('do not match an account');
});

test('a forgotten password is reset by e-mail', async ({ page }) => {
	const email = uniqueEmail('installer');
	await page.goto('/sign-up?as=installer');
	await page.getByLabel('Your name').fill('Reg Spanner');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill('first passphrase here');
	await page.getByRole('button', { name: 'Create account' }).click();
	await expect(page).toHaveURL(/verify-email/);

	await page.goto('/forgot-password');
	await page.getByLabel('E-mail').fill(email);
	await page.getByRole('button', { name: 'Send the link' }).click();
	await expect(page.getByText('If an account uses that address')).toBeVisible();
	const mail = await waitForMail(email, /Reset your Tapline password/);
	await page.goto(linkIn(mail, '/reset-password?token='));
	await page.getByLabel('New password', { exact: true }).fill('second passphrase here');
	await page.getByLabel('New password again').fill('second passphrase here');
	await page.getByRole('button', { name: 'Save the new password' }).click();
	await expect(page.getByText('Your password is changed')).toBeVisible();
	await signIn(page, email, 'second passphrase here');
	await expect(page).toHaveURL(/\/installer$/);
});

test('sign-up answers a taken address exactly like a free one and explains by e-mail', async ({
	page,
	browser
}) => {
	const taken = await newAccount(browser, 'owner', 'taken');
	await taken.context.close();
	const answers = [];
	for (const email of [taken.email, uniqueEmail('free')]) {
		await page.goto('/sign-up');
		await page.getByLabel('Your name').fill('Ada Quill');
		await page.getByLabel('E-mail').fill(email);
		await page.getByLabel('Password').fill('long enough passphrase');
		await page.getByRole('button', { name: 'Create account' }).click();
		await expect(page).toHaveURL(/\/verify-email\?sent=1/);
		answers.push(await page.locator('main').innerText());
	}
	expect(answers[0]).toBe(answers[1]);
	const mail = await waitForMail(taken.email, /tried to sign up/);
	expect(linkIn(mail, '/sign-in')).toContain('/sign-in');
	expect(mail.text).toContain('/forgot-password');
});

test('an unconfirmed account is sent to a page that explains and resends the link', async ({
	browser
}) => {
	const context = await browser.newContext({ baseURL: BASE_URL });
	const email = uniqueEmail('unconfirmed');
	const password = 'long enough passphrase';
	const fields = { role: 'installer', displayName: 'Una Confirmed', email, password };
	expect((await postForm(context.request, '/sign-up', fields)).status()).toBe(303);
	expect((await postForm(context.request, '/sign-in', { email, password })).status()).toBe(303);
	// Sending an application needs a confirmed address: the server refuses and says where to go.
	const submit = await postForm(context.request, '/installer?/submit', {});
	expect(submit.status()).toBe(303);
	expect(submit.headers()['location']).toBe('/verify-email?needed=1');

	const page = await context.newPage();
	await page.goto('/verify-email?needed=1');
	await expect(page.getByRole('alert')).toContainText('Confirm your e-mail address first');
	await page.getByRole('button', { name: 'Send the link again' }).click();
	await expect(page.getByText('A new link is on its way.')).toBeVisible();
	await context.close();
});

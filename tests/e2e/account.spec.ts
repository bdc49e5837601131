// Issue 12: the account page, reached from the header, on a desktop and on a 360 px phone: name,
// ending another device's session, password, and an e-mail change confirmed from the inbox.
import { expect, linkIn, test, uniqueEmail, waitForMail } from './fixtures';
import { newAccount, postForm, signedIn } from './support/requests';

const PASSWORD = 'long enough passphrase';
const VIEWPORTS = {
	desktop: { width: 1280, height: 800 },
	phone: { width: 360, height: 740 }
} as const;

for (const [name, viewport] of Object.entries(VIEWPORTS)) {
	test(`account settings on a ${name}: name, sessions, password, e-mail`, async ({ browser }) => {
		const me = await newAccount(browser, 'owner', `account-${name}`);
		const page = await me.context.newPage();
		await page.setViewportSize(viewport);
		const elsewhere = await signedIn(browser, me.email, PASSWORD);

		// From the header: the role's label beside the name on wide screens, a button on phones.
		await page.goto('/owner');
		if (name === 'desktop') {
			await page.getByRole('link', { name: 'Testing Person · Car owner' }).click();
		} else {
			await page.getByRole('link', { name: 'Your account' }).click();
		}
		await expect(page.getByRole('heading', { name: 'Your account' })).toBeVisible();
		expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
			viewport.width
		);

		// Name.
		await page.getByLabel('Name', { exact: true }).fill('Robin Vale');
		await page.getByRole('button', { name: 'Save the name' }).click();
		await expect(page.getByText('Your name is now Robin Vale.')).toBeVisible();
		await expect(page.getByLabel('Name', { exact: true })).toHaveValue('Robin Vale');

		// Sessions: this one and the other browser; end the other.
		const sessions = page.getByTestId('session');
		await expect(sessions).toHaveCount(2);
		await expect(
			sessions.filter({ has: page.getByText('This device', { exact: true }) })
		).toHaveCount(1);
		await sessions
			.filter({ has: page.getByText('Another device', { exact: true }) })
			.getByRole('button', { name: 'Sign this device out' })
			.click();
		await expect(page.getByText('That device is signed out.')).toBeVisible();
		await expect(sessions).toHaveCount(1);
		const shut = await elsewhere.request.get('/account', { maxRedirects: 0 });
		expect(shut.status()).toBe(303);
		expect(shut.headers()['location']).toMatch(/^\/sign-in/);

		// Password: a wrong current one is refused; the right one signs out the other device.
		const third = await signedIn(browser, me.email, PASSWORD);
		const passwordForm = page.locator('form[action="?/changePassword"]');
		await passwordForm.getByLabel('Current password').fill('not the password');
		await passwordForm.getByLabel('New password', { exact: true }).fill('an even longer phrase');
		await passwordForm.getByLabel('New password again').fill('an even longer phrase');
		await passwordForm.getByRole('button', { name: 'Change the password' }).click();
		await expect(
			passwordForm.getByText('That is not your current password.').first()
		).toBeVisible();
		await passwordForm.getByLabel('Current password').fill(PASSWORD);
		await passwordForm.getByLabel('New password', { exact: true }).fill('an even longer phrase');
		await passwordForm.getByLabel('New password again').fill('an even longer phrase');
		await passwordForm.getByRole('button', { name: 'Change the password' }).click();
		await expect(
			page.getByText('Your password is changed, and 1 other device is signed out.')
		).toBeVisible();
		expect((await third.request.get('/account', { maxRedirects: 0 })).status()).toBe(303);
		const again = await postForm(third.request, '/sign-in', {
			email: me.email,
			password: 'an even longer phrase'
		});
		expect(again.status()).toBe(303);

		// E-mail: the old address stays until the link sent to the new one is opened.
		const newEmail = uniqueEmail(`moved-${name}`);
		const emailForm = page.locator('form[action="?/changeEmail"]');
		await emailForm.getByLabel('New e-mail address').fill(newEmail);
		await emailForm.getByLabel('Current password').fill('an even longer phrase');
		await emailForm.getByRole('button', { name: 'Send the link' }).click();
		await expect(page.getByText(`We sent a link to ${newEmail}.`)).toBeVisible();
		await expect(page.getByText(`You sign in with ${me.email}.`)).toBeVisible();
		await waitForMail(me.email, /about to change/);
		const mail = await waitForMail(newEmail, /Confirm your new e-mail address/);
		await page.goto(linkIn(mail, '/account/email?token='));
		await page.getByRole('button', { name: 'Use this address' }).click();
		await expect(page.getByText('Your e-mail address is changed.')).toBeVisible();
		await expect(page.getByText(`You sign in with ${newEmail}.`)).toBeVisible();
		await waitForMail(me.email, /e-mail address changed/);
		expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
			viewport.width
		);

		await Promise.all([me.context.close(), elsewhere.close(), third.close()]);
	});
}

test('the account page and its actions need a session', async ({ request }) => {
	const page = await request.get('/account', { maxRedirects: 0 });
	expect(page.status()).toBe(303);
	expect(page.headers()['location']).toMatch(/^\/sign-in\?redirectTo=%2Faccount/);
	for (const action of ['changeName', 'changePassword', 'endOtherSessions', 'closeAccount']) {
		const res = await postForm(request, `/account?/${action}`, { displayName: 'Nobody' });
		expect(res.status(), action).toBe(303);
		expect(res.headers()['location'], action).toMatch(/^\/sign-in/);
	}
});

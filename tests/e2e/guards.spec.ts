import { expect, test, uniqueEmail, waitForMail } from './fixtures';

test('no session: a role area sends you to sign in and back again', async ({ page }) => {
	await page.goto('/admin/team');
	await expect(page).toHaveURL(/\/sign-in\?redirectTo=%2Fadmin%2Fteam/);
	await page.getByLabel('E-mail').fill('demo.admin@tapline.test');
	await page.getByLabel('Password').fill('tapline-demo-2026');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await expect(page).toHaveURL(/\/admin\/team$/);
});

test('an owner is refused the installer and admin areas', async ({ ownerPage: page }) => {
	await expect(page).toHaveURL(/\/owner$/);
	for (const path of ['/installer', '/admin', '/admin/team', '/admin/users']) {
		const res = await page.goto(path);
		expect(res?.status()).toBe(403);
		await expect(page.getByText('Not for this account')).toBeVisible();
	}
});

test('an installer sees their own area and is refused the owner area', async ({
	installerPage: page
}) => {
	await expect(page.getByRole('heading', { name: 'My work' })).toBeVisible();
	await expect(page.getByTestId('vetting-standing')).toHaveText('Vetted: you can quote');
	expect((await page.goto('/owner'))?.status()).toBe(403);
});

test('a form action in a role area is refused to the wrong role too', async ({
	ownerPage: page
}) => {
	const res = await page.request.post('/admin/team?/createAdmin', {
		form: { displayName: 'Sneaky', email: uniqueEmail('sneaky') },
		headers: { origin: new URL(page.url()).origin }
	});
	expect(res.status()).toBe(403);
	// Suspending an account is an admin's action: an owner posting it is refused and nothing changes.
	const suspend = await page.request.post(`/admin/users/${crypto.randomUUID()}?/suspend`, {
		form: { reason: 'Trying my luck', confirm: 'true' },
		headers: { origin: new URL(page.url()).origin }
	});
	expect(suspend.status()).toBe(403);
});

test('an admin sees the overview and adds another admin, who is e-mailed', async ({
	adminPage: page
}) => {
	await expect(page.getByRole('heading', { name: 'Overview' })).toBeVisible();
	await expect(page.getByText('Vetted installers')).toBeVisible();
	await page.getByRole('link', { name: 'Admin team' }).first().click();
	const email = uniqueEmail('admin');
	await page.getByLabel('Name').fill('Wynn Ashgrove');
	await page.getByLabel('E-mail').fill(email);
	await page.getByRole('button', { name: 'Create admin account' }).click();
	await expect(page.getByText('Wynn Ashgrove is an admin now')).toBeVisible();
	await expect(page.getByRole('listitem').filter({ hasText: email })).toBeVisible();
	const mail = await waitForMail(email, /made a Tapline admin/);
	expect(mail.text).toContain('/reset-password?token=');
});

test('a malformed id is a 404 from the router, before any page code runs', async ({
	ownerPage: page
}) => {
	for (const path of [
		'/owner/jobs/not-a-job',
		'/owner/jobs/1%27%20or%201=1',
		'/owner/bookings/12345',
		'/installers/nobody',
		'/media/job-photos/not-a-photo/thumb',
		'/media/installer-documents/not-a-document'
	]) {
		const res = await page.goto(path);
		expect(res?.status(), path).toBe(404);
	}
});

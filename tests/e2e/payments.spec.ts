/**
 * The payment provider's webhook route against the running app: unsigned, wrongly signed and stale
 * deliveries are refused with 400, a correctly signed one is accepted once. The signature is made
 * here exactly as Stripe makes it (HMAC-SHA256 of "t.payload" with the endpoint's secret).
 */
import { createHmac } from 'node:crypto';
import { expect, signIn, test } from './fixtures';
import { closeQueries, query } from './support/requests';

test.afterAll(closeQueries);

const SECRET = process.env.STRIPE_WEBHOOK_SECRET ?? '';
const sign = (payload: string, t: number, secret = SECRET) =>
	`t=${String(t)},v1=${createHmac('sha256', secret)
		.update(`${String(t)}.${payload}`)
		.digest('hex')}`;
const now = () => Math.floor(Date.now() / 1000);

test('the webhook refuses unsigned, wrongly signed and stale events, and takes a signed one once', async ({
	request
}) => {
	expect(SECRET).not.toBe('');
	const payload = JSON.stringify({
		id: `evt_e2e_${String(Date.now())}`,
		object: 'event',
		type: 'balance.available',
		created: now(),
		data: { object: {} }
	});
	const post = (signature?: string) =>
		request.post('/api/webhooks/stripe', {
			data: payload,
			headers: {
				'content-type': 'application/json',
				...(signature ? { 'stripe-signature': signature } : {})
			}
		});
	expect((await post()).status()).toBe(400);
	expect((await post(sign(payload, now(), 'whsec_not_ours'))).status()).toBe(400);
	expect((await post(sign(payload, now() - 3600))).status()).toBe(400);
	const first = await post(sign(payload, now()));
	expect(first.status()).toBe(200);
	expect(await first.json()).toMatchObject({ outcome: 'processed' });
	const again = await post(sign(payload, now()));
	expect(await again.json()).toMatchObject({ outcome: 'already processed' });
});

test('a vetted installer without payouts is asked to set them up, and onboarding on the provider’s page enables them', async ({
	page
}) => {
	// A vetted demo installer no other test uses, as if payouts had never been set up.
	const email = 'omar.kassab@tapline.test';
	const reset = await query(
		`UPDATE installer_profile SET payouts_enabled = false, payout_account_id = NULL
		 WHERE user_id = (SELECT id FROM "user" WHERE email = $1) RETURNING user_id`,
		[email]
	);
	expect(reset).toHaveLength(1);
	await signIn(page, email);
	await page.goto('/installer');
	await expect(page.getByTestId('payouts-needed')).toContainText('set up payouts');
	await page.getByTestId('payouts-needed').getByRole('link', { name: 'set up payouts' }).click();
	await expect(page.getByTestId('payouts-status')).toHaveText('Payouts are not set up yet.');
	await page.getByRole('button', { name: 'Set up payouts' }).click();
	// The payment provider's own onboarding page (the payments fake).
	await expect(page.getByRole('heading', { name: 'Set up payouts' })).toBeVisible();
	await page.getByLabel('Business name').fill('Marion Mobile Fitting');
	await page.getByLabel('BSB').fill('000-000');
	await page.getByLabel('Account number').fill('000123456');
	await page.getByRole('button', { name: 'Agree and submit' }).click();
	await expect(page).toHaveURL(/\/installer\/payouts\?returned=1$/);
	await expect(page.getByTestId('payouts-status')).toHaveText('Payouts are set up.');
	await page.goto('/installer');
	await expect(page.getByTestId('payouts-needed')).toHaveCount(0);
});

test('an admin must tick "I am sure" before money moves, and the page lists paid bookings or says none', async ({
	adminPage: page
}) => {
	await page.goto('/admin/payments');
	await expect(page.getByRole('heading', { name: 'Payments' })).toBeVisible();
	for (const action of ['release', 'refund']) {
		const res = await page.request.post(`/admin/payments?/${action}`, {
			form: { bookingId: crypto.randomUUID(), amount: '10.00' },
			headers: { origin: new URL(page.url()).origin, accept: 'application/json' }
		});
		const body = (await res.json()) as { status: number; data: string };
		expect(body.status, action).toBe(400);
		expect(body.data, action).toContain('I am sure');
	}
});

/**
 * The payment provider's webhook route against the running app: unsigned, wrongly signed and stale
 * deliveries are refused with 400, a correctly signed one is accepted once. The signature is made
 * here exactly as Stripe makes it (HMAC-SHA256 of "t.payload" with the endpoint's secret).
 */
import { createHmac } from 'node:crypto';
import { expect, test } from './fixtures';

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

import { mkdtemp, rm } from 'node:fs/promises';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Stripe from 'stripe';
import { afterEach, describe, expect, it } from 'vitest';
import { DEMO_CONNECTED_ACCOUNTS } from './data/stripe-demo-accounts';
import { startStripeFake, type StripeFake } from './stripe';

const SECRET = 'whsec_spec';
const running: { close(): Promise<void> }[] = [];
afterEach(async () => {
	await Promise.all(running.splice(0).map((r) => r.close()));
});

async function start(options: { dataDir?: string; webhookUrl?: string } = {}) {
	const fake = await startStripeFake({
		host: '127.0.0.1',
		port: 0,
		webhookSecret: SECRET,
		retryBaseMs: 10,
		maxAttempts: 3,
		...options
	});
	running.push(fake);
	return fake;
}

const sdk = (fake: StripeFake, key = 'sk_test_spec') =>
	new Stripe(key, { host: '127.0.0.1', port: fake.port, protocol: 'http', maxNetworkRetries: 0 });

/** A webhook receiver that answers with the given statuses in turn, then 200. */
async function receiver(statuses: number[] = []) {
	const received: { body: string; signature: string }[] = [];
	const server: Server = createServer((req, res) => {
		let body = '';
		req.on('data', (c: Buffer) => (body += c.toString()));
		req.on('end', () => {
			received.push({ body, signature: String(req.headers['stripe-signature']) });
			res.statusCode = statuses.shift() ?? 200;
			res.end();
		});
	});
	await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
	running.push({ close: () => new Promise<void>((r) => server.close(() => r())) });
	return { url: `http://127.0.0.1:${String((server.address() as AddressInfo).port)}/`, received };
}

const checkout = {
	mode: 'payment' as const,
	success_url: 'http://shop.test/ok?session={CHECKOUT_SESSION_ID}',
	cancel_url: 'http://shop.test/back',
	line_items: [
		{
			quantity: 1,
			price_data: { currency: 'aud', unit_amount: 12_345, product_data: { name: 'Fit' } }
		}
	],
	payment_intent_data: { transfer_group: 'group_1', metadata: { booking_id: 'b1' } },
	metadata: { booking_id: 'b1' }
};

async function payOnPage(fake: StripeFake, sessionId: string, card: string) {
	return fetch(`${fake.url}/checkout/pay/${sessionId}`, {
		method: 'POST',
		headers: { 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({ card, expiry: '12 / 40', cvc: '123' }),
		redirect: 'manual'
	});
}

describe('payments fake', () => {
	it('refuses a request without an API key with 401 in Stripe’s error shape', async () => {
		const fake = await start();
		const res = await fetch(`${fake.url}/v1/balance`);
		expect(res.status).toBe(401);
		const body = (await res.json()) as { error: { type: string; message: string } };
		expect(body.error.type).toBe('invalid_request_error');
		expect(body.error.message).toContain('API key');
	});

	it('reads form-encoded nested parameters and gives ids Stripe’s prefixes', async () => {
		const fake = await start();
		const session = await sdk(fake).checkout.sessions.create(checkout);
		expect(session.id).toMatch(/^cs_test_/);
		expect(session.amount_total).toBe(12_345);
		expect(session.metadata).toEqual({ booking_id: 'b1' });
		const account = await sdk(fake).accounts.create({ type: 'express', country: 'AU' });
		expect(account.id).toMatch(/^acct_/);
		const missing = await fetch(`${fake.url}/v1/checkout/sessions`, {
			method: 'POST',
			headers: {
				authorization: 'Bearer sk_test_x',
				'content-type': 'application/x-www-form-urlencoded'
			},
			body: 'mode=payment'
		});
		expect(missing.status).toBe(400);
		expect(((await missing.json()) as { error: { code: string } }).error.code).toBe(
			'parameter_missing'
		);
	});

	it('replays an Idempotency-Key and refuses it with other parameters', async () => {
		const fake = await start();
		const a = await sdk(fake).checkout.sessions.create(checkout, { idempotencyKey: 'same' });
		const b = await sdk(fake).checkout.sessions.create(checkout, { idempotencyKey: 'same' });
		expect(b.id).toBe(a.id);
		expect(b.lastResponse.headers['idempotent-replayed']).toBe('true');
		await expect(
			sdk(fake).checkout.sessions.create(
				{ ...checkout, metadata: { booking_id: 'other' } },
				{ idempotencyKey: 'same' }
			)
		).rejects.toMatchObject({ type: 'StripeIdempotencyError', statusCode: 400 });
	});

	it('answers 404 resource_missing for an unknown object', async () => {
		const fake = await start();
		await expect(sdk(fake).charges.retrieve('ch_nope')).rejects.toMatchObject({
			statusCode: 404,
			code: 'resource_missing'
		});
	});

	it('takes the published test cards on its hosted page and signs events as Stripe does', async () => {
		const hook = await receiver();
		const fake = await start({ webhookUrl: hook.url });
		const stripe = sdk(fake);
		const session = await stripe.checkout.sessions.create(checkout);
		const declined = await payOnPage(fake, session.id, '4000 0000 0000 0002');
		expect(declined.status).toBe(402);
		expect(await declined.text()).toContain('Your card was declined.');
		const poor = await payOnPage(fake, session.id, '4000000000009995');
		expect(await poor.text()).toContain('Your card has insufficient funds.');
		const typo = await payOnPage(fake, session.id, '4242424242424241');
		expect(await typo.text()).toContain('Your card number is incorrect.');
		const ok = await payOnPage(fake, session.id, '4242424242424242');
		expect(ok.status).toBe(303);
		expect(ok.headers.get('location')).toBe(`http://shop.test/ok?session=${session.id}`);

		const done = await stripe.checkout.sessions.retrieve(session.id);
		expect(done.payment_status).toBe('paid');
		const types = hook.received.map(
			(r) => stripe.webhooks.constructEvent(r.body, r.signature, SECRET).type
		);
		expect(types).toEqual([
			'charge.failed',
			'payment_intent.payment_failed',
			'charge.failed',
			'payment_intent.payment_failed',
			'charge.succeeded',
			'payment_intent.succeeded',
			'checkout.session.completed'
		]);
		expect(hook.received[0]!.signature).toMatch(/^t=\d+,v1=[0-9a-f]{64}$/);
		expect(() =>
			stripe.webhooks.constructEvent(
				hook.received[0]!.body,
				hook.received[0]!.signature,
				'whsec_other'
			)
		).toThrow();
	});

	it('asks for authentication with 4000002500003155 and pays once it is completed', async () => {
		const fake = await start();
		const session = await sdk(fake).checkout.sessions.create(checkout);
		const asked = await payOnPage(fake, session.id, '4000002500003155');
		expect(asked.headers.get('location')).toBe(`/checkout/pay/${session.id}/authenticate`);
		const done = await fetch(`${fake.url}/checkout/pay/${session.id}/authenticate`, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
			body: 'result=complete',
			redirect: 'manual'
		});
		expect(done.status).toBe(303);
		expect((await sdk(fake).checkout.sessions.retrieve(session.id)).status).toBe('complete');
	});

	it('refunds in part and in full, never above what is left, and keeps the balance', async () => {
		const fake = await start();
		const stripe = sdk(fake);
		const session = await stripe.checkout.sessions.create(checkout);
		await payOnPage(fake, session.id, '4242424242424242');
		const pi = (await stripe.checkout.sessions.retrieve(session.id)).payment_intent as string;
		await stripe.refunds.create({ payment_intent: pi, amount: 345 });
		await expect(
			stripe.refunds.create({ payment_intent: pi, amount: 12_001 })
		).rejects.toMatchObject({
			statusCode: 400,
			code: 'amount_too_large'
		});
		await stripe.refunds.create({ payment_intent: pi });
		await expect(stripe.refunds.create({ payment_intent: pi })).rejects.toMatchObject({
			code: 'charge_already_refunded'
		});
		expect((await stripe.balance.retrieve()).available[0]!.amount).toBe(0);
	});

	it('transfers only to onboarded accounts and only from available funds', async () => {
		const fake = await start();
		const stripe = sdk(fake);
		const account = await stripe.accounts.create({ type: 'express', country: 'AU' });
		await expect(
			stripe.transfers.create({ amount: 100, currency: 'aud', destination: account.id })
		).rejects.toMatchObject({ code: 'insufficient_capabilities_for_transfer' });
		const link = await stripe.accountLinks.create({
			account: account.id,
			type: 'account_onboarding',
			return_url: 'http://shop.test/done',
			refresh_url: 'http://shop.test/again'
		});
		const onboarded = await fetch(link.url, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
			body: new URLSearchParams({
				business_name: 'A',
				bsb: '000-000',
				account_number: '000123456'
			}),
			redirect: 'manual'
		});
		expect(onboarded.headers.get('location')).toBe('http://shop.test/done');
		// The link is single-use: a second visit goes to refresh_url.
		const again = await fetch(link.url, { redirect: 'manual' });
		expect(again.headers.get('location')).toBe('http://shop.test/again');
		expect((await stripe.accounts.retrieve(account.id)).payouts_enabled).toBe(true);
		await expect(
			stripe.transfers.create({ amount: 100, currency: 'aud', destination: account.id })
		).rejects.toMatchObject({ code: 'balance_insufficient' });
		const session = await stripe.checkout.sessions.create(checkout);
		await payOnPage(fake, session.id, '4242424242424242');
		const transfer = await stripe.transfers.create({
			amount: 10_000,
			currency: 'aud',
			destination: account.id,
			transfer_group: 'group_1'
		});
		expect(transfer.id).toMatch(/^tr_/);
		expect((await stripe.balance.retrieve()).available[0]!.amount).toBe(2345);
	});

	it('retries a failed delivery with back-off and re-sends on demand', async () => {
		const hook = await receiver([500, 503]);
		const fake = await start({ webhookUrl: hook.url });
		const stripe = sdk(fake);
		await stripe.accounts.create({ type: 'express' });
		const link = await stripe.accountLinks.create({
			account: (await stripe.accounts.create({ type: 'express' })).id,
			type: 'account_onboarding',
			return_url: 'http://shop.test/done',
			refresh_url: 'http://shop.test/again'
		});
		await fetch(link.url, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
			body: new URLSearchParams({ business_name: 'A', bsb: '000000', account_number: '12345678' }),
			redirect: 'manual'
		});
		await expect.poll(() => hook.received.length).toBe(3);
		const deliveries = (await (await fetch(`${fake.url}/control/deliveries`)).json()) as {
			eventId: string;
			attempt: number;
			status: number;
		}[];
		expect(deliveries.map((d) => [d.attempt, d.status])).toEqual([
			[1, 500],
			[2, 503],
			[3, 200]
		]);
		await fetch(`${fake.url}/control/events/${deliveries[0]!.eventId}/resend`, { method: 'POST' });
		expect(hook.received).toHaveLength(4);
	});

	it('fails the next requests on demand with a 500 api_error', async () => {
		const fake = await start();
		const stripe = sdk(fake);
		await fetch(`${fake.url}/control/fail-next`, { method: 'POST', body: '{"count":1}' });
		await expect(stripe.balance.retrieve()).rejects.toMatchObject({ statusCode: 500 });
		expect((await stripe.balance.retrieve()).object).toBe('balance');
		// Letting one through first: the second request fails, the third passes.
		await fetch(`${fake.url}/control/fail-next`, { method: 'POST', body: '{"count":1,"skip":1}' });
		expect((await stripe.balance.retrieve()).object).toBe('balance');
		await expect(stripe.balance.retrieve()).rejects.toMatchObject({ statusCode: 500 });
		expect((await stripe.balance.retrieve()).object).toBe('balance');
	});

	it('does the work of a slow-next call at once and holds only its answer', async () => {
		const fake = await start();
		await fetch(`${fake.url}/control/slow-next`, {
			method: 'POST',
			body: '{"count":1,"ms":60000}'
		});
		const quick = new Stripe('sk_test_spec', {
			host: '127.0.0.1',
			port: fake.port,
			protocol: 'http',
			maxNetworkRetries: 0,
			timeout: 300
		});
		await expect(
			quick.checkout.sessions.create(checkout, { idempotencyKey: 'held' })
		).rejects.toMatchObject({ type: 'StripeConnectionError' });
		// The session exists although its answer never came; the same key gives it back at once.
		const again = await quick.checkout.sessions.create(checkout, { idempotencyKey: 'held' });
		expect(again.lastResponse.headers['idempotent-replayed']).toBe('true');
		expect(again.status).toBe('open');
	});

	it('keeps its objects in the data folder across restarts, and starts with the demo accounts', async () => {
		const dir = await mkdtemp(join(tmpdir(), 'stripe-fake-'));
		try {
			const first = await start({ dataDir: dir });
			const account = await sdk(first).accounts.create({ type: 'express' });
			await first.close();
			running.splice(running.indexOf(first), 1);
			const second = await start({ dataDir: dir });
			expect((await sdk(second).accounts.retrieve(account.id)).id).toBe(account.id);
			const demo = await sdk(second).accounts.retrieve(DEMO_CONNECTED_ACCOUNTS[0]!.id);
			expect(demo.payouts_enabled).toBe(true);
		} finally {
			await rm(dir, { recursive: true, force: true });
		}
	});
});

// Held-funds tests: the payments fake started in-process, a small HTTP server standing in for the
// app's webhook route (it calls the same function the route calls), and helpers to book and pay.
import type { Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { eq } from 'drizzle-orm';
import { startStripeFake, type StripeFake, type WebhookDelivery } from '../../local-fakes/stripe';
import { bookQuote } from '$lib/server/marketplace/bookings';
import { db } from '$lib/server/db';
import { booking, payment, quote } from '$lib/server/db/schema';
import { startHeldFundsPayment } from '$lib/server/money/payments';
import { startPayoutOnboarding } from '$lib/server/money/payouts';
import { submitQuote } from '$lib/server/marketplace/quotes';
import { startWebhookReceiver } from '../../seed/webhook-receiver';
import { ADELAIDE, goodQuote, makeInstaller, makeOpenJob, pricedParts } from './matching-helpers';

export const WEBHOOK_SECRET = 'whsec_integration_test_secret';

export interface PaymentsWorld {
	fake: StripeFake;
	hook: Server;
	close(): Promise<void>;
	control(path: string, body?: unknown): Promise<unknown>;
	deliveries(): Promise<WebhookDelivery[]>;
}

/** Starts the fake and the webhook receiver and points the SDK at them (through the env). */
export async function startPaymentsWorld(): Promise<PaymentsWorld> {
	const hook = await startWebhookReceiver();
	const hookPort = (hook.address() as AddressInfo).port;
	const fake = await startStripeFake({
		host: '127.0.0.1',
		port: 0,
		webhookUrl: `http://127.0.0.1:${String(hookPort)}/`,
		webhookSecret: WEBHOOK_SECRET,
		retryBaseMs: 20,
		maxAttempts: 8
	});
	process.env.STRIPE_SECRET_KEY = 'sk_test_integration';
	process.env.STRIPE_WEBHOOK_SECRET = WEBHOOK_SECRET;
	process.env.STRIPE_API_HOST = '127.0.0.1';
	process.env.STRIPE_API_PORT = String(fake.port);
	process.env.STRIPE_API_PROTOCOL = 'http';
	const control = async (path: string, body: unknown = {}) => {
		const res = await fetch(`${fake.url}/control${path}`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify(body)
		});
		return res.json() as Promise<unknown>;
	};
	return {
		fake,
		hook,
		control,
		deliveries: async () =>
			(await (await fetch(`${fake.url}/control/deliveries`)).json()) as WebhookDelivery[],
		close: async () => {
			await fake.close();
			await new Promise<void>((resolve) => hook.close(() => resolve()));
		}
	};
}

/** An open job with one quote per installer; returns the job, its owner, quotes and installers. */
export async function jobWithQuotes(count = 1) {
	const made = await makeOpenJob(ADELAIDE);
	const installers = [];
	for (let i = 0; i < count; i++) {
		const installer = await makeInstaller({ base: ADELAIDE });
		const sent = await submitQuote(installer.id, made.job.id, goodQuote(pricedParts(made.job)));
		if (!sent.ok) throw new Error(sent.message);
		installers.push(installer);
	}
	const quotes = await db.select().from(quote).where(eq(quote.jobId, made.job.id));
	return { ...made, installers, quotes };
}

/** A provisional booking of a fresh job's first quote, and the checkout opened for it. */
export async function bookAndOpenCheckout(count = 1, now = new Date()) {
	const world = await jobWithQuotes(count);
	const chosen = world.quotes[0]!;
	const booked = await bookQuote(
		world.ownerId,
		world.job.id,
		chosen.id,
		chosen.slots[0]!.start,
		now
	);
	if (!booked.ok) throw new Error(booked.message);
	const sessionId = await openCheckout(booked.bookingId, now);
	return { ...world, chosen, bookingId: booked.bookingId, sessionId };
}

/** Opens (or reopens) the booking's checkout; returns the session id. */
export async function openCheckout(bookingId: string, now = new Date()) {
	const started = await startHeldFundsPayment(bookingId, now);
	if (!('status' in started) || started.status !== 'redirect') {
		throw new Error(`checkout did not open: ${JSON.stringify(started)}`);
	}
	const [row] = await db.select().from(payment).where(eq(payment.bookingId, bookingId));
	if (!row?.checkoutSessionId) throw new Error('no session stored');
	return row.checkoutSessionId;
}

/** Pays a session as the hosted card page would, with one of the published test cards. */
export async function payWith(world: PaymentsWorld, sessionId: string, card: string) {
	return world.control(`/checkout/sessions/${sessionId}/pay`, { card });
}

/**
 * Gives an installer a connected account through the real onboarding flow: Tapline's start, then
 * the fake's hosted form posted as a browser would.
 */
export async function onboardInstaller(installerId: string) {
	const started = await startPayoutOnboarding(installerId);
	if (!started.ok) throw new Error(started.message);
	const res = await fetch(started.url, {
		method: 'POST',
		headers: { 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({
			business_name: 'Test Fitting',
			bsb: '000-000',
			account_number: '000123456'
		}),
		redirect: 'manual'
	});
	if (res.status !== 303) throw new Error(`onboarding answered ${String(res.status)}`);
	return res.headers.get('location');
}

/** The published test card that always succeeds. */
export const SUCCESS_CARD = '4242424242424242';

/** A paid, confirmed booking whose installer has onboarded in the fake (stage 'to fit'). */
export async function paidBookingIn(world: PaymentsWorld, count = 1, now = new Date()) {
	const made = await bookAndOpenCheckout(count, now);
	await onboardInstaller(made.chosen.installerId);
	await payWith(world, made.sessionId, SUCCESS_CARD);
	const [row] = await db.select().from(booking).where(eq(booking.id, made.bookingId));
	if (row?.status !== 'confirmed') throw new Error(`booking not confirmed: ${String(row?.status)}`);
	return made;
}

/**
 * The one payment-provider client: the `stripe` SDK configured from the environment. In
 * production only the keys are set; locally and in tests STRIPE_API_HOST, STRIPE_API_PORT and
 * STRIPE_API_PROTOCOL point it elsewhere (the scripts set them); STRIPE_TIMEOUT_MS bounds each
 * attempt. Nothing else builds a client.
 */
import Stripe from 'stripe';
import { env } from '$env/dynamic/private';
import { feeSettingsFrom, type FeeSettings } from '$lib/money/fees';
import { DEFAULT_LATE_FEE_CENTS } from '$lib/money/cancellation';

let client: Stripe | null = null;
let clientKey = '';

/** The SDK client; created on first use from the environment (tests change it between files). */
export function stripe(): Stripe {
	const key = env.STRIPE_SECRET_KEY;
	if (!key) throw new Error('STRIPE_SECRET_KEY is not set');
	const timeout = Number(env.STRIPE_TIMEOUT_MS) > 0 ? Number(env.STRIPE_TIMEOUT_MS) : 20_000;
	const signature = [
		key,
		env.STRIPE_API_HOST,
		env.STRIPE_API_PORT,
		env.STRIPE_API_PROTOCOL,
		timeout
	].join('|');
	if (client && clientKey === signature) return client;
	const protocol = env.STRIPE_API_PROTOCOL === 'http' ? 'http' : 'https';
	client = new Stripe(key, {
		...(env.STRIPE_API_HOST ? { host: env.STRIPE_API_HOST } : {}),
		...(env.STRIPE_API_PORT ? { port: Number(env.STRIPE_API_PORT) } : {}),
		protocol,
		// A retried POST carries the same idempotency key, so it cannot pay twice.
		maxNetworkRetries: 1,
		// STRIPE_TIMEOUT_MS (default 20 s): how long one attempt waits for an answer.
		timeout
	});
	clientKey = signature;
	return client;
}

/** The webhook endpoint's signing secret. */
export function webhookSecret(): string {
	const secret = env.STRIPE_WEBHOOK_SECRET;
	if (!secret) throw new Error('STRIPE_WEBHOOK_SECRET is not set');
	return secret;
}

/** Tapline's fee settings: TAPLINE_FEE_PERCENT (default 10) and TAPLINE_FEE_MINIMUM_CENTS (1500). */
export function feeSettings(): FeeSettings {
	return feeSettingsFrom(env.TAPLINE_FEE_PERCENT, env.TAPLINE_FEE_MINIMUM_CENTS);
}

/** The late-cancellation fee paid to the installer: TAPLINE_LATE_CANCEL_FEE_CENTS (5000). */
export function lateFeeCents(): number {
	const n = Number(env.TAPLINE_LATE_CANCEL_FEE_CENTS);
	return Number.isSafeInteger(n) && n >= 0 && env.TAPLINE_LATE_CANCEL_FEE_CENTS
		? n
		: DEFAULT_LATE_FEE_CENTS;
}

/** The booking's transfer group: its charge and every transfer for it carry this. */
export const transferGroupOf = (bookingId: string) => `booking_${bookingId}`;

/** Whether an error came from the provider being unreachable or failing (worth retrying later). */
export function isProviderOutage(err: unknown): boolean {
	return (
		err instanceof Stripe.errors.StripeConnectionError ||
		err instanceof Stripe.errors.StripeAPIError ||
		(err instanceof Stripe.errors.StripeError && (err.statusCode ?? 0) >= 500) ||
		(err instanceof Stripe.errors.StripeError && err.statusCode === 409)
	);
}

export { Stripe };

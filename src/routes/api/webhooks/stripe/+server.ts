import { error, json } from '@sveltejs/kit';
import { receivePaymentWebhook } from '$lib/server/money/payments';
import { isServiceUnavailable, SERVICE_UNAVAILABLE_MESSAGE } from '$lib/server/http/unavailable';
import type { RequestHandler } from './$types';

/**
 * The payment provider's webhook. The raw body is what was signed, so it is read as text and
 * handed over untouched; the signature is checked by the SDK (`constructEvent`). No session: the
 * signature is the authentication.
 */
export const POST: RequestHandler = async ({ request }) => {
	let outcome;
	try {
		outcome = await receivePaymentWebhook(
			await request.text(),
			request.headers.get('stripe-signature')
		);
	} catch (err) {
		// The provider retries a 503; its body says the database is away, not "500" (hooks add Retry-After).
		if (isServiceUnavailable(err)) error(503, SERVICE_UNAVAILABLE_MESSAGE);
		throw err;
	}
	if (outcome.status === 400) error(400, outcome.message);
	return json({ received: true, outcome: outcome.message });
};

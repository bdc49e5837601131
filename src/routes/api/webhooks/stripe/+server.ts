import { error, json } from '@sveltejs/kit';
import { receivePaymentWebhook } from '$lib/server/money/payments';
import type { RequestHandler } from './$types';

/**
 * The payment provider's webhook. The raw body is what was signed, so it is read as text and
 * handed over untouched; the signature is checked by the SDK (`constructEvent`). No session: the
 * signature is the authentication.
 */
export const POST: RequestHandler = async ({ request }) => {
	const outcome = await receivePaymentWebhook(
		await request.text(),
		request.headers.get('stripe-signature')
	);
	if (outcome.status === 400) error(400, outcome.message);
	return json({ received: true, outcome: outcome.message });
};

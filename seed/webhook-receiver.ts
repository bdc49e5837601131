/**
 * A stand-in for the app's webhook route when the app is not running (the seed, the integration
 * tests): it takes the payments fake's signed POSTs and hands them to the function the route
 * calls, at the clock the caller gives.
 */
import { createServer, type Server } from 'node:http';
import { receivePaymentWebhook } from '$lib/server/money/payments';

/** Listens on a free loopback port; read it from `server.address()`. */
export async function startWebhookReceiver(clock: () => Date = () => new Date()): Promise<Server> {
	const hook = createServer((req, res) => {
		const chunks: Buffer[] = [];
		req.on('data', (c: Buffer) => chunks.push(c));
		req.on('end', () => {
			const signature = req.headers['stripe-signature'];
			receivePaymentWebhook(
				Buffer.concat(chunks).toString('utf8'),
				typeof signature === 'string' ? signature : null,
				clock()
			).then(
				(outcome) => {
					res.statusCode = outcome.status;
					res.end(outcome.message);
				},
				(err: unknown) => {
					res.statusCode = 500;
					res.end(String(err));
				}
			);
		});
	});
	await new Promise<void>((resolve) => hook.listen(0, '127.0.0.1', resolve));
	return hook;
}

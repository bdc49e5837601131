// What the demo seed needs around it, as under npm start: the object store and the payments fake
// (started in-process), with the app's webhook route stood in for by payments-helpers' receiver.
import { startS3Fake } from '../../local-fakes/s3';
import { startPaymentsWorld } from './payments-helpers';

/** Starts the fakes the seed uses and points the environment at them; returns the stop. */
export async function startDemoWorld(): Promise<() => Promise<void>> {
	const s3 = await startS3Fake({ host: '127.0.0.1', port: 0 });
	process.env.S3_ENDPOINT = s3.url;
	process.env.S3_BUCKET = 'seed-test';
	const payments = await startPaymentsWorld();
	const { port } = payments.hook.address() as { port: number };
	// The seed receives the fake's webhooks itself while it runs, then hands them back here.
	process.env.FAKE_STRIPE_WEBHOOK_URL = `http://127.0.0.1:${String(port)}/`;
	return async () => {
		await payments.close();
		await s3.close();
	};
}

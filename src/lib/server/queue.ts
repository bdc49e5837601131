/**
 * Background work for the whole product: pg-boss, a kept PostgreSQL-backed queue. Jobs live in the
 * `pgboss` schema, so they survive restarts and any number of app processes can work the same
 * queues (each job is fetched with SKIP LOCKED by exactly one of them).
 */
import PgBoss from 'pg-boss';
import { env } from '$env/dynamic/private';
import { deliverEmail, listStrandedEmails } from './mail';
import { registerMarketplaceWork } from './marketplace-work';
import { runInsuranceExpiryCheck } from './vetting';

export const EMAIL_QUEUE = 'email-deliver';
const EMAIL_SWEEP = 'email-sweep';
export const INSURANCE_EXPIRY_QUEUE = 'insurance-expiry';

let boss: PgBoss | undefined;
let starting: Promise<PgBoss> | undefined;

/** Starts the queue and its workers once per process. */
export function startQueue(): Promise<PgBoss> {
	starting ??= (async () => {
		const instance = new PgBoss({
			connectionString: env.DATABASE_URL,
			schema: 'pgboss',
			max: 4,
			application_name: 'tapline-worker'
		});
		instance.on('error', (err) => console.error('[queue]', err));
		await instance.start();
		// Back-off from 5 s doubling: a short SMTP outage is bridged within minutes, a long one within hours.
		await instance.createQueue(EMAIL_QUEUE, {
			name: EMAIL_QUEUE,
			retryLimit: 12,
			retryDelay: 5,
			retryBackoff: true
		});
		await instance.createQueue(EMAIL_SWEEP, { name: EMAIL_SWEEP });
		await instance.work<{ id: string }>(
			EMAIL_QUEUE,
			{ pollingIntervalSeconds: 1, batchSize: 5 },
			async (jobs) => {
				for (const job of jobs) {
					const result = await deliverEmail(job.data.id);
					if (typeof result === 'object') throw new Error(result.error);
				}
			}
		);
		// Catches anything whose enqueue was lost (process died between commit and send).
		await instance.schedule(EMAIL_SWEEP, '*/5 * * * *');
		await instance.work(EMAIL_SWEEP, async () => {
			for (const id of await listStrandedEmails(5 * 60_000)) {
				await instance.send(EMAIL_QUEUE, { id });
			}
		});
		// Daily at 06:00 Adelaide time, before the working day: pg-boss keeps one schedule per queue
		// across all processes and runs it once, and the check itself is idempotent, so a retry or a
		// second run the same day sends nothing twice.
		await instance.createQueue(INSURANCE_EXPIRY_QUEUE, {
			name: INSURANCE_EXPIRY_QUEUE,
			retryLimit: 3,
			retryDelay: 300
		});
		await instance.schedule(INSURANCE_EXPIRY_QUEUE, '0 6 * * *', undefined, {
			tz: 'Australia/Adelaide'
		});
		await instance.work(INSURANCE_EXPIRY_QUEUE, async () => {
			const result = await runInsuranceExpiryCheck();
			await Promise.all(result.emailIds.map((id) => instance.send(EMAIL_QUEUE, { id })));
		});
		await registerMarketplaceWork(instance);
		boss = instance;
		return instance;
	})();
	return starting;
}

/** Asks a worker to deliver outbox messages now; the sweeper covers a failure here. */
export async function requestEmailDelivery(ids: string[]): Promise<void> {
	if (!boss || ids.length === 0) return;
	try {
		await Promise.all(ids.map((id) => boss!.send(EMAIL_QUEUE, { id })));
	} catch (err) {
		console.error('[queue] could not enqueue e-mail; the sweeper will pick it up', err);
	}
}

/** Stops workers, letting running jobs finish. */
export async function stopQueue(): Promise<void> {
	if (boss) await boss.stop({ graceful: true, wait: true });
	boss = undefined;
	starting = undefined;
}

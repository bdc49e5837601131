/**
 * Background work for the whole product, registered in this one place: pg-boss, a kept
 * PostgreSQL-backed queue. Jobs and schedules live in the `pgboss` schema, so they survive restarts
 * and any number of app processes can work the same queues (each job is fetched with SKIP LOCKED
 * by exactly one of them; each schedule fires once across all processes).
 *
 * | queue                | when                        | what                                          |
 * | -------------------- | --------------------------- | --------------------------------------------- |
 * | `email-deliver`      | after each commit with mail | sends one outbox message (retries, back-off)  |
 * | `email-sweep`        | every 5 minutes             | re-queues messages whose request was lost     |
 * | `insurance-expiry`   | daily 06:00 Adelaide        | reminders at 30 and 7 days, pause on expiry   |
 * | `new-job-digest`     | daily 07:00 Adelaide        | one new-job e-mail a day per installer        |
 * | `quote-digest`       | debounced per job; sweep 10 min | one owner e-mail per burst of quotes      |
 * | `booking-hold-lapse` | every minute                | lapses provisional bookings past their hold   |
 * | `held-funds-release` | every 5 minutes             | retries releases the provider did not take    |
 * | `booking-auto-confirm` | every minute              | confirms work whose owner's window closed     |
 * | `booking-reminder`   | every 10 minutes            | e-mails both sides a day before a paid fit    |
 */
import PgBoss from 'pg-boss';
import { env } from '$env/dynamic/private';
import { QUEUES, QUOTE_DIGEST_SECONDS, setBoss } from './boss';
import { retryPendingReleases } from './money/payments';
import { lapseExpiredHolds } from './marketplace/bookings';
import { confirmOverdueWork } from './work/completion';
import { sendDueReminders } from './work/reminders';
import { deliverEmail, listStrandedEmails } from './mail/outbox';
import { sendNewJobDigests } from './marketplace/matching';
import { listJobsWithUnsentQuotes, sendOwnerQuoteDigest } from './marketplace/quotes';
import { runInsuranceExpiryCheck } from './people/vetting';

const ADELAIDE = { tz: 'Australia/Adelaide' };

let starting: Promise<PgBoss> | undefined;
let running: PgBoss | undefined;

/**
 * pg-boss 10 does not await marking a finished job complete or failed (`Manager.complete` and
 * `Manager.fail`, called from its worker without `await`). When the database goes away at that
 * moment the rejection is unhandled and Node ends the process (found by the database-restart
 * drill). The job stays active, expires and runs again, so such a rejection is only logged; any
 * other unhandled rejection still ends the process, as Node's default does.
 */
function survivePgBossLateWrites(): void {
	process.on('unhandledRejection', (reason) => {
		const stack = reason instanceof Error ? (reason.stack ?? '') : '';
		if (/Manager\.(complete|fail) .*pg-boss/.test(stack)) {
			console.error('[queue] could not record a job result; it will run again:', String(reason));
			return;
		}
		throw reason;
	});
}

/** Starts the queue and its workers once per process. */
export function startQueue(): Promise<PgBoss> {
	starting ??= (async () => {
		survivePgBossLateWrites();
		const boss = new PgBoss({
			connectionString: env.DATABASE_URL,
			schema: 'pgboss',
			max: 4,
			application_name: 'tapline-worker'
		});
		boss.on('error', (err) => console.error('[queue]', err));
		await boss.start();
		await registerWork(boss);
		running = boss;
		setBoss(boss);
		return boss;
	})();
	return starting;
}

async function registerWork(boss: PgBoss): Promise<void> {
	// E-mail: back-off from 5 s doubling, so a short SMTP outage is bridged within minutes and a
	// long one within hours.
	await boss.createQueue(QUEUES.emailDeliver, {
		name: QUEUES.emailDeliver,
		retryLimit: 12,
		retryDelay: 5,
		retryBackoff: true
	});
	await boss.work<{ id: string }>(
		QUEUES.emailDeliver,
		{ pollingIntervalSeconds: 1, batchSize: 5 },
		async (jobs) => {
			for (const job of jobs) {
				const result = await deliverEmail(job.data.id);
				// A temporary failure throws so pg-boss retries; 'failed' (permanent) does not.
				if (typeof result === 'object') throw new Error(result.error);
			}
		}
	);
	// Catches anything whose enqueue was lost (process died between commit and send).
	await boss.createQueue(QUEUES.emailSweep, { name: QUEUES.emailSweep });
	await boss.schedule(QUEUES.emailSweep, '*/5 * * * *');
	await boss.work(QUEUES.emailSweep, async () => {
		for (const id of await listStrandedEmails(5 * 60_000)) {
			await boss.send(QUEUES.emailDeliver, { id });
		}
	});

	// Insurance: before the working day; the check is idempotent, so a retry or a second run the
	// same day sends nothing twice.
	await boss.createQueue(QUEUES.insuranceExpiry, {
		name: QUEUES.insuranceExpiry,
		retryLimit: 3,
		retryDelay: 300
	});
	await boss.schedule(QUEUES.insuranceExpiry, '0 6 * * *', undefined, ADELAIDE);
	await boss.work(QUEUES.insuranceExpiry, async () => {
		await runInsuranceExpiryCheck();
	});

	for (const name of [
		QUEUES.newJobDigest,
		QUEUES.quoteDigest,
		QUEUES.bookingHoldLapse,
		QUEUES.heldFundsRelease,
		QUEUES.bookingAutoConfirm,
		QUEUES.bookingReminder
	]) {
		await boss.createQueue(name, { name, retryLimit: 3, retryDelay: 60 });
	}
	// New jobs: one e-mail a day at most, before the working day. The board shows new jobs at
	// once; the e-mail is the reminder, not the feed.
	await boss.schedule(QUEUES.newJobDigest, '0 7 * * *', undefined, ADELAIDE);
	await boss.work(QUEUES.newJobDigest, async () => {
		await sendNewJobDigests();
	});
	// Quotes: debounced per job (see requestQuoteDigest); the scheduled run without a job id is
	// the sweep for quotes whose debounced e-mail was never enqueued.
	await boss.schedule(QUEUES.quoteDigest, '*/10 * * * *');
	await boss.work<{ jobId?: string }>(QUEUES.quoteDigest, async (jobs) => {
		for (const job of jobs) {
			if (job.data.jobId) {
				await sendOwnerQuoteDigest(job.data.jobId);
			} else {
				const cutoff = new Date(Date.now() - 2 * QUOTE_DIGEST_SECONDS * 1000);
				for (const jobId of await listJobsWithUnsentQuotes(cutoff)) {
					await sendOwnerQuoteDigest(jobId);
				}
			}
		}
	});
	// Holds: a provisional booking lapses within a minute of its hold running out.
	await boss.schedule(QUEUES.bookingHoldLapse, '* * * * *');
	await boss.work(QUEUES.bookingHoldLapse, async () => {
		await lapseExpiredHolds();
	});
	// Payouts: a release the payment provider did not take is tried again every five minutes;
	// the idempotency key and the row lock make a retry safe however often it runs.
	await boss.schedule(QUEUES.heldFundsRelease, '*/5 * * * *');
	await boss.work(QUEUES.heldFundsRelease, async () => {
		await retryPendingReleases();
	});
	// Confirmation: work whose owner did not answer within the window confirms itself within a
	// minute of the deadline; the row lock and the stage check make a second worker a no-op.
	await boss.schedule(QUEUES.bookingAutoConfirm, '* * * * *');
	await boss.work(QUEUES.bookingAutoConfirm, async () => {
		await confirmOverdueWork();
	});
	// Reminders: within 10 minutes of a paid fit coming within a day; the marker set with the
	// outbox rows makes a second worker or a retry send nothing twice.
	await boss.schedule(QUEUES.bookingReminder, '*/10 * * * *');
	await boss.work(QUEUES.bookingReminder, async () => {
		await sendDueReminders();
	});
}

/** Stops workers, letting running jobs finish. */
export async function stopQueue(): Promise<void> {
	setBoss(undefined);
	if (running) await running.stop({ graceful: true, wait: true });
	running = undefined;
	starting = undefined;
}

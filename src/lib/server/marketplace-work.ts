/**
 * Background work of the marketplace, on the product's one pg-boss: the installers' daily
 * new-job digest, the owners' quote e-mails (debounced so a burst of quotes becomes one e-mail),
 * and the sweep that lapses provisional bookings whose hold ran out.
 */
import type PgBoss from 'pg-boss';
import { lapseExpiredHolds } from './bookings';
import { sendNewJobDigests } from './matching';
import { listJobsWithUnsentQuotes, sendOwnerQuoteDigest } from './quotes';

export const NEW_JOB_DIGEST_QUEUE = 'new-job-digest';
export const QUOTE_DIGEST_QUEUE = 'quote-digest';
export const BOOKING_HOLD_QUEUE = 'booking-hold-lapse';
const EMAIL_QUEUE = 'email-deliver';

/**
 * Quotes arriving within this many seconds of each other share one owner e-mail: pg-boss's
 * sendDebounced keeps at most one job per window per job id and puts later ones in the next.
 */
export const QUOTE_DIGEST_SECONDS = 120;

let boss: PgBoss | undefined;

async function deliver(instance: PgBoss, ids: string[]) {
	await Promise.all(ids.map((id) => instance.send(EMAIL_QUEUE, { id })));
}

/** Creates the marketplace's queues, schedules and workers; called once from startQueue. */
export async function registerMarketplaceWork(instance: PgBoss): Promise<void> {
	for (const name of [NEW_JOB_DIGEST_QUEUE, QUOTE_DIGEST_QUEUE, BOOKING_HOLD_QUEUE]) {
		await instance.createQueue(name, { name, retryLimit: 3, retryDelay: 60 });
	}
	// Daily at 07:00 Adelaide time: one e-mail a day at most, before the working day. The job
	// board shows new jobs at once; the e-mail is the reminder, not the feed.
	await instance.schedule(NEW_JOB_DIGEST_QUEUE, '0 7 * * *', undefined, {
		tz: 'Australia/Adelaide'
	});
	await instance.work(NEW_JOB_DIGEST_QUEUE, async () => {
		await deliver(instance, await sendNewJobDigests());
	});
	await instance.work<{ jobId?: string }>(QUOTE_DIGEST_QUEUE, async (jobs) => {
		for (const job of jobs) {
			if (job.data.jobId) {
				await deliver(instance, await sendOwnerQuoteDigest(job.data.jobId));
			} else {
				// The scheduled sweep: quotes whose debounced e-mail was never enqueued.
				const cutoff = new Date(Date.now() - 2 * QUOTE_DIGEST_SECONDS * 1000);
				for (const jobId of await listJobsWithUnsentQuotes(cutoff)) {
					await deliver(instance, await sendOwnerQuoteDigest(jobId));
				}
			}
		}
	});
	await instance.schedule(QUOTE_DIGEST_QUEUE, '*/10 * * * *');
	// Every minute: a hold lapses within a minute of running out (owner pages also check on read).
	await instance.schedule(BOOKING_HOLD_QUEUE, '* * * * *');
	await instance.work(BOOKING_HOLD_QUEUE, async () => {
		await deliver(instance, await lapseExpiredHolds());
	});
	boss = instance;
}

/**
 * Asks for the owner's quote e-mail about a job, debounced per job; the scheduled sweep covers a
 * failure here or a process with no worker.
 */
export async function requestQuoteDigest(jobId: string): Promise<void> {
	if (!boss) return;
	try {
		await boss.sendDebounced(QUOTE_DIGEST_QUEUE, { jobId }, {}, QUOTE_DIGEST_SECONDS, jobId);
	} catch (err) {
		console.error('[marketplace] could not enqueue the quote e-mail; the sweep will', err);
	}
}

/**
 * The process's handle on pg-boss and the names of every queue. `queue.ts` starts the instance
 * and registers the workers; modules that only need to send a job import this one, so the domain
 * modules and the registry do not import each other.
 */
import type PgBoss from 'pg-boss';

export const QUEUES = {
	emailDeliver: 'email-deliver',
	emailSweep: 'email-sweep',
	insuranceExpiry: 'insurance-expiry',
	newJobDigest: 'new-job-digest',
	quoteDigest: 'quote-digest',
	bookingHoldLapse: 'booking-hold-lapse',
	heldFundsRelease: 'held-funds-release',
	bookingAutoConfirm: 'booking-auto-confirm',
	bookingReminder: 'booking-reminder'
} as const;

/**
 * Quotes arriving within this many seconds of each other share one owner e-mail: pg-boss's
 * sendDebounced keeps at most one job per window per job id and puts later ones in the next.
 */
export const QUOTE_DIGEST_SECONDS = 120;

let boss: PgBoss | undefined;

/** Records the running instance (or clears it on stop). */
export function setBoss(instance: PgBoss | undefined): void {
	boss = instance;
}

/** Asks a worker to deliver outbox messages now; the sweeper covers a failure here. */
export async function requestEmailDelivery(ids: readonly string[]): Promise<void> {
	if (!boss || ids.length === 0) return;
	try {
		for (const id of ids) await boss.send(QUEUES.emailDeliver, { id });
	} catch (err) {
		console.error('[queue] could not enqueue e-mail; the sweeper will pick it up', err);
	}
}

/**
 * Asks for the owner's quote e-mail about a job, debounced per job; the scheduled sweep covers a
 * failure here or a process with no worker.
 */
export async function requestQuoteDigest(jobId: string): Promise<void> {
	if (!boss) return;
	try {
		await boss.sendDebounced(QUEUES.quoteDigest, { jobId }, {}, QUOTE_DIGEST_SECONDS, jobId);
	} catch (err) {
		console.error('[queue] could not enqueue the quote e-mail; the sweep will', err);
	}
}

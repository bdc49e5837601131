import { and, eq, inArray } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { booking, emailOutbox, job, quote, user } from '$lib/server/db/schema';
import {
	bookQuote,
	confirmBooking,
	getLiveBookingForJob,
	HOLD_MINUTES,
	lapseExpiredHolds
} from '$lib/server/marketplace/bookings';
import { startHeldFundsPayment } from '$lib/server/money/payments';
import { listQuotesForOwner, submitQuote } from '$lib/server/marketplace/quotes';
import {
	ADELAIDE,
	goodQuote,
	makeInstaller,
	makeOpenJob,
	pricedParts,
	slotOn,
	workday
} from './matching-helpers';

/** A job with quotes from `count` installers; returns the quote rows. */
async function jobWithQuotes(count: number) {
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

/** The e-mails of one template queued to one account's address. */
async function mailsTo(userId: string, template: string) {
	return db
		.select({ subject: emailOutbox.subject, text: emailOutbox.text })
		.from(emailOutbox)
		.innerJoin(user, eq(user.email, emailOutbox.toAddress))
		.where(and(eq(user.id, userId), eq(emailOutbox.template, template)));
}

describe('booking a quote', () => {
	it('holds the slot, books the job, accepts one quote and politely declines the rest', async () => {
		const { job: j, ownerId, quotes, installers } = await jobWithQuotes(3);
		const chosen = quotes[0]!;
		const now = new Date();
		const result = await bookQuote(ownerId, j.id, chosen.id, chosen.slots[1]!.start, now);
		expect(result.ok).toBe(true);
		const [made] = await db.select().from(booking).where(eq(booking.jobId, j.id));
		expect(made?.status).toBe('awaiting_payment');
		expect(made?.slotStart.toISOString()).toBe(chosen.slots[1]!.start);
		expect(made!.holdExpiresAt.getTime() - now.getTime()).toBe(HOLD_MINUTES * 60_000);
		const [after] = await db.select().from(job).where(eq(job.id, j.id));
		expect(after?.status).toBe('booked');
		const statuses = await db
			.select({ id: quote.id, status: quote.status })
			.from(quote)
			.where(eq(quote.jobId, j.id));
		expect(statuses.find((s) => s.id === chosen.id)?.status).toBe('accepted');
		expect(statuses.filter((s) => s.status === 'declined')).toHaveLength(2);

		const declinedEmails = installers
			.filter((i) => i.id !== chosen.installerId)
			.map((i) => i.email);
		const mails = await db
			.select()
			.from(emailOutbox)
			.where(
				and(
					eq(emailOutbox.template, 'quote-declined'),
					inArray(emailOutbox.toAddress, declinedEmails)
				)
			);
		expect(mails).toHaveLength(2);
		expect(mails[0]?.text).toContain('booked another installer');
		const provisional = await db
			.select()
			.from(emailOutbox)
			.where(eq(emailOutbox.template, 'booking-provisional'));
		expect(
			provisional.some((m) =>
				installers.some((i) => i.email === m.toAddress && i.id === chosen.installerId)
			)
		).toBe(true);
		// The owner is told too: what is held, until when, and where the booking is.
		const ownerMails = await mailsTo(ownerId, 'booking-started');
		expect(ownerMails).toHaveLength(1);
		expect(ownerMails[0]?.text).toContain(`/owner/bookings/${made!.id}`);
		expect(ownerMails[0]?.text).toContain('Nothing has been charged yet');
	});

	it('refuses a time the installer did not offer and a stranger', async () => {
		const { job: j, ownerId, quotes } = await jobWithQuotes(1);
		const q = quotes[0]!;
		expect(await bookQuote(ownerId, j.id, q.id, new Date().toISOString())).toMatchObject({
			ok: false,
			status: 400,
			message: 'Choose one of the times the installer offered.'
		});
		const stranger = crypto.randomUUID();
		expect(await bookQuote(stranger, j.id, q.id, q.slots[0]!.start)).toMatchObject({ status: 404 });
		expect(await db.select().from(booking).where(eq(booking.jobId, j.id))).toHaveLength(0);
	});
});

describe('concurrency', () => {
	it('two tabs booking two quotes of one job at once end in exactly one booking', async () => {
		const { job: j, ownerId, quotes } = await jobWithQuotes(2);
		const results = await Promise.all(
			quotes.map((q) => bookQuote(ownerId, j.id, q.id, q.slots[0]!.start))
		);
		expect(results.filter((r) => r.ok)).toHaveLength(1);
		const loser = results.find((r) => !r.ok);
		expect(loser).toMatchObject({ ok: false, status: 409 });
		expect(await db.select().from(booking).where(eq(booking.jobId, j.id))).toHaveLength(1);
		const accepted = await db
			.select()
			.from(quote)
			.where(and(eq(quote.jobId, j.id), eq(quote.status, 'accepted')));
		expect(accepted).toHaveLength(1);
	});

	it('two jobs booking the same installer slot at once end in exactly one booking', async () => {
		const installer = await makeInstaller({ base: ADELAIDE });
		const slots = [slotOn(workday(2), '09:00', '11:00'), slotOn(workday(3), '09:00', '11:00')];
		const jobs = [await makeOpenJob(ADELAIDE), await makeOpenJob(ADELAIDE)];
		const quoteIds: string[] = [];
		for (const { job: j } of jobs) {
			const sent = await submitQuote(installer.id, j.id, goodQuote(pricedParts(j), { slots }));
			if (!sent.ok) throw new Error(sent.message);
			quoteIds.push(sent.quoteId);
		}
		const start = slots[0]!.start.toISOString();
		const results = await Promise.all(
			jobs.map(({ job: j, ownerId }, i) => bookQuote(ownerId, j.id, quoteIds[i]!, start))
		);
		expect(results.filter((r) => r.ok)).toHaveLength(1);
		expect(results.find((r) => !r.ok)).toMatchObject({
			ok: false,
			status: 409,
			message:
				'The installer was booked for an overlapping time on another job a moment ago. Choose another time.'
		});
		const live = await db
			.select()
			.from(booking)
			.where(and(eq(booking.installerId, installer.id), eq(booking.status, 'awaiting_payment')));
		expect(live).toHaveLength(1);
		// The losing job is untouched and can still book the other time.
		const loserIndex = results.findIndex((r) => !r.ok);
		const loser = jobs[loserIndex]!;
		const [loserJob] = await db.select().from(job).where(eq(job.id, loser.job.id));
		expect(loserJob?.status).toBe('collecting_quotes');
		const retry = await bookQuote(
			loser.ownerId,
			loser.job.id,
			quoteIds[loserIndex]!,
			slots[1]!.start.toISOString()
		);
		expect(retry.ok).toBe(true);
	});
});

describe('holds and payment', () => {
	it('lapses a hold that ran out, frees the slot and reopens the job', async () => {
		const installer = await makeInstaller({ base: ADELAIDE });
		const slots = [slotOn(workday(4), '09:00', '11:00'), slotOn(workday(5), '09:00', '11:00')];
		const a = await makeOpenJob(ADELAIDE);
		const b = await makeOpenJob(ADELAIDE);
		const qa = await submitQuote(installer.id, a.job.id, goodQuote(pricedParts(a.job), { slots }));
		const qb = await submitQuote(installer.id, b.job.id, goodQuote(pricedParts(b.job), { slots }));
		if (!qa.ok || !qb.ok) throw new Error('quotes not sent');
		const start = slots[0]!.start.toISOString();
		const longAgo = new Date(Date.now() - (HOLD_MINUTES + 5) * 60_000);
		expect((await bookQuote(a.ownerId, a.job.id, qa.quoteId, start, longAgo)).ok).toBe(true);

		// Booking job B at the same time lapses A's expired hold first, so it succeeds.
		expect((await bookQuote(b.ownerId, b.job.id, qb.quoteId, start)).ok).toBe(true);
		const [held] = await db.select().from(booking).where(eq(booking.jobId, a.job.id));
		expect(held?.status).toBe('lapsed');
		const [reopened] = await db.select().from(job).where(eq(job.id, a.job.id));
		expect(reopened?.status).toBe('collecting_quotes');
		const [liveAgain] = await db.select().from(quote).where(eq(quote.id, qa.quoteId));
		expect(liveAgain?.status).toBe('live');
		// A's owner hears that the hold ran out and where to book again; B's owner does not.
		const lapsedMails = await mailsTo(a.ownerId, 'booking-lapsed-owner');
		expect(lapsedMails).toHaveLength(1);
		expect(lapsedMails[0]?.text).toContain(`/owner/jobs/${a.job.id}/quotes`);
		expect(await mailsTo(b.ownerId, 'booking-lapsed-owner')).toHaveLength(0);
	});

	it('the scheduled sweep lapses expired holds and leaves current ones', async () => {
		const { job: j, ownerId, quotes } = await jobWithQuotes(1);
		const q = quotes[0]!;
		await bookQuote(ownerId, j.id, q.id, q.slots[0]!.start);
		expect(await lapseExpiredHolds({ jobId: j.id })).toBe(0);
		const later = new Date(Date.now() + (HOLD_MINUTES + 1) * 60_000);
		// Reading never writes: before the sweep, the run-out hold already reads as no live booking
		// while its row still says awaiting payment.
		expect(await getLiveBookingForJob(j.id)).not.toBeNull();
		expect(await getLiveBookingForJob(j.id, later)).toBeNull();
		const [unswept] = await db.select().from(booking).where(eq(booking.jobId, j.id));
		expect(unswept?.status).toBe('awaiting_payment');
		expect(await lapseExpiredHolds({ jobId: j.id }, later)).toBe(1);
		const [b] = await db.select().from(booking).where(eq(booking.jobId, j.id));
		expect(b?.status).toBe('lapsed');
	});

	it('pretends no payment: with the provider unreachable it says so, and only confirmBooking confirms', async () => {
		const { job: j, ownerId, quotes } = await jobWithQuotes(1);
		const q = quotes[0]!;
		const made = await bookQuote(ownerId, j.id, q.id, q.slots[0]!.start);
		if (!made.ok) throw new Error(made.message);
		// Nothing listens on port 9 (discard): the payment provider is down.
		process.env.STRIPE_SECRET_KEY = 'sk_test_unreachable';
		process.env.STRIPE_API_HOST = '127.0.0.1';
		process.env.STRIPE_API_PORT = '9';
		process.env.STRIPE_API_PROTOCOL = 'http';
		expect(await startHeldFundsPayment(made.bookingId)).toMatchObject({
			status: 'unavailable',
			message: expect.stringContaining('Nothing has been charged') as unknown
		});
		const [still] = await db.select().from(booking).where(eq(booking.id, made.bookingId));
		expect(still?.status).toBe('awaiting_payment');
		const before = await listQuotesForOwner(j.id, ownerId);
		expect(before?.[0]?.fitsCompleted).toBe(0);
		expect(await confirmBooking(made.bookingId)).toEqual({ ok: true });
		const after = await listQuotesForOwner(j.id, ownerId);
		expect(after?.[0]?.fitsCompleted).toBe(1);
		expect(await confirmBooking(made.bookingId)).toMatchObject({ ok: false, status: 409 });
	});
});

// Issue 11, item 4: a suspended or paused installer's quotes cannot be booked, suspension
// withdraws their open quotes and tells the owners, and a paused installer's quotes show as on hold.
import { and, eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { booking, emailOutbox, installerProfile, quote, user } from '$lib/server/db/schema';
import { bookQuote } from '$lib/server/marketplace/bookings';
import { listQuotesForOwner, submitQuote } from '$lib/server/marketplace/quotes';
import { decideApplication } from '$lib/server/people/vetting';
import { postJobMessage } from '$lib/server/marketplace/threads';
import { ADELAIDE, goodQuote, makeInstaller, makeOpenJob, pricedParts } from './matching-helpers';
import { makeAccount } from './vetting-helpers';

/** An open job with one live quote from a vetted installer. */
async function quotedJob() {
	const made = await makeOpenJob(ADELAIDE);
	const installer = await makeInstaller({ base: ADELAIDE });
	const sent = await submitQuote(installer.id, made.job.id, goodQuote(pricedParts(made.job)));
	if (!sent.ok) throw new Error(sent.message);
	const [q] = await db.select().from(quote).where(eq(quote.jobId, made.job.id));
	if (!q) throw new Error('no quote');
	return { ...made, installer, quote: q };
}

async function suspend(installerId: string) {
	const admin = await makeAccount('admin');
	return decideApplication({
		adminId: admin.id,
		installerId,
		decision: 'suspend',
		expectedStatus: 'approved',
		message: 'Complaint under review.',
		checklist: { identityMatches: false, insuranceCurrent: false, abnValidAndActive: false }
	});
}

const bookingsOf = (jobId: string) =>
	db.select({ id: booking.id }).from(booking).where(eq(booking.jobId, jobId));

describe('booking and the installer’s standing', () => {
	it('refuses to book a paused installer and shows their quote as on hold', async () => {
		const { job: j, ownerId, installer, quote: q } = await quotedJob();
		await db
			.update(installerProfile)
			.set({ pausedReason: 'Insurance expired.' })
			.where(eq(installerProfile.userId, installer.id));
		const result = await bookQuote(ownerId, j.id, q.id, q.slots[0]!.start);
		expect(result).toMatchObject({ ok: false, status: 409 });
		expect(!result.ok && result.message).toContain('on hold');
		expect(await bookingsOf(j.id)).toHaveLength(0);
		const listed = await listQuotesForOwner(j.id, ownerId);
		expect(listed?.[0]).toMatchObject({ status: 'live', onHold: true });

		await db
			.update(installerProfile)
			.set({ pausedReason: null })
			.where(eq(installerProfile.userId, installer.id));
		expect((await listQuotesForOwner(j.id, ownerId))?.[0]?.onHold).toBe(false);
		expect((await bookQuote(ownerId, j.id, q.id, q.slots[0]!.start)).ok).toBe(true);
	});

	it('refuses to book a quote whose installer was suspended behind its back', async () => {
		const { job: j, ownerId, installer, quote: q } = await quotedJob();
		// As if the suspension had not withdrawn the quote: the standing alone must refuse.
		await db
			.update(installerProfile)
			.set({ vettingStatus: 'suspended' })
			.where(eq(installerProfile.userId, installer.id));
		expect(await bookQuote(ownerId, j.id, q.id, q.slots[0]!.start)).toMatchObject({
			ok: false,
			status: 409
		});
		expect(await bookingsOf(j.id)).toHaveLength(0);
	});

	it('withdraws a suspended installer’s open quotes and e-mails each owner', async () => {
		const first = await quotedJob();
		const second = await makeOpenJob(ADELAIDE);
		const sent = await submitQuote(
			first.installer.id,
			second.job.id,
			goodQuote(pricedParts(second.job))
		);
		expect(sent.ok).toBe(true);
		expect((await suspend(first.installer.id)).ok).toBe(true);

		const quotes = await db
			.select({ status: quote.status })
			.from(quote)
			.where(eq(quote.installerId, first.installer.id));
		expect(quotes.map((r) => r.status)).toEqual(['withdrawn', 'withdrawn']);
		for (const made of [first, second]) {
			const [owner] = await db
				.select({ email: user.email })
				.from(user)
				.where(eq(user.id, made.ownerId));
			const [ownerMail] = await db
				.select()
				.from(emailOutbox)
				.where(
					and(
						eq(emailOutbox.toAddress, owner!.email),
						eq(emailOutbox.template, 'quote-withdrawn-suspended')
					)
				);
			expect(ownerMail?.text).toContain('withdrew their quote');
			expect(ownerMail?.text).toContain(`/owner/jobs/${made.job.id}/quotes`);
		}
		expect(
			await bookQuote(first.ownerId, first.job.id, first.quote.id, first.quote.slots[0]!.start)
		).toMatchObject({ ok: false, status: 409 });
	});

	it('serves a booking and a suspension racing each other without a booking of a suspended installer', async () => {
		for (let round = 0; round < 4; round++) {
			const { job: j, ownerId, installer, quote: q } = await quotedJob();
			const [booked, suspended] = await Promise.all([
				bookQuote(ownerId, j.id, q.id, q.slots[0]!.start),
				suspend(installer.id)
			]);
			expect(suspended.ok).toBe(true);
			const [after] = await db
				.select({ status: quote.status })
				.from(quote)
				.where(eq(quote.id, q.id));
			// Either the booking came first (the quote is accepted) or the suspension did (the
			// booking was refused and the quote withdrawn); never a deadlock or a booked withdrawal.
			expect(booked.ok ? 'accepted' : 'withdrawn').toBe(after?.status);
		}
	});

	it('stops a paused installer posting questions, except about a job booked with them (item 16)', async () => {
		const { job: j, ownerId, installer, quote: q } = await quotedJob();
		const asks = { id: installer.id, role: 'installer' as const };
		const pause = (reason: string | null) =>
			db
				.update(installerProfile)
				.set({ pausedReason: reason })
				.where(eq(installerProfile.userId, installer.id));
		await pause('Insurance expired.');
		const refused = await postJobMessage(j.id, installer.id, asks, 'Is the car garaged?');
		expect(refused).toMatchObject({ ok: false, status: 403 });
		expect(!refused.ok && refused.message).toContain('paused');

		await pause(null);
		expect((await bookQuote(ownerId, j.id, q.id, q.slots[0]!.start)).ok).toBe(true);
		await pause('Insurance expired.');
		expect((await postJobMessage(j.id, installer.id, asks, 'See you Tuesday.')).ok).toBe(true);
	});
});

import { and, eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { emailOutbox, installerBlockedDate, jobMessage, quote } from '$lib/server/db/schema';
import { bookQuote, confirmBooking, HOLD_MINUTES } from '$lib/server/marketplace/bookings';
import { blockDate } from '$lib/server/work/diary';
import {
	getInstallerDay,
	listNewJobsForDay,
	listQuotesAwaitingAnswer,
	listRecentThreads,
	listUpcomingFits
} from '$lib/server/work/installer-day';
import { submitQuote } from '$lib/server/marketplace/quotes';
import {
	getOwnerThread,
	OWNER_MAY_NOT_MESSAGE,
	postJobMessage
} from '$lib/server/marketplace/threads';
import type { LatLng } from '$lib/geo';
import {
	ADELAIDE,
	goodQuote,
	makeInstaller,
	makeOpenJob,
	makeUser,
	pricedParts,
	slotOn,
	workday,
	ZONE
} from './matching-helpers';

/**
 * An open job with a quote from `installerId` offering times on the `k`-th and next workday;
 * returns the job, its owner and the quote.
 */
async function quotedJob(installerId: string, at: LatLng = ADELAIDE, k = 0) {
	const made = await makeOpenJob(at);
	const slots = [slotOn(workday(k), '09:00', '11:00'), slotOn(workday(k + 1), '13:00', '15:00')];
	const sent = await submitQuote(
		installerId,
		made.job.id,
		goodQuote(pricedParts(made.job), { slots })
	);
	if (!sent.ok) throw new Error(sent.message);
	const [q] = await db
		.select()
		.from(quote)
		.where(and(eq(quote.jobId, made.job.id), eq(quote.installerId, installerId)));
	return { ...made, quote: q! };
}

describe("the installer's booked fits", () => {
	it('lists their own live bookings soonest first, paged, never another installer’s', async () => {
		const mine = await makeInstaller();
		const other = await makeInstaller();
		const later = await quotedJob(mine.id);
		const sooner = await quotedJob(mine.id);
		const theirs = await quotedJob(other.id);
		// Slot 1 of the later job is on the second workday, slot 0 of the sooner one on the first.
		expect(
			(await bookQuote(later.ownerId, later.job.id, later.quote.id, later.quote.slots[1]!.start)).ok
		).toBe(true);
		expect(
			(
				await bookQuote(
					sooner.ownerId,
					sooner.job.id,
					sooner.quote.id,
					sooner.quote.slots[0]!.start
				)
			).ok
		).toBe(true);
		expect(
			(
				await bookQuote(
					theirs.ownerId,
					theirs.job.id,
					theirs.quote.id,
					theirs.quote.slots[0]!.start
				)
			).ok
		).toBe(true);

		const all = await listUpcomingFits(mine.id, { limit: 10 });
		expect(all.rows.map((f) => f.jobId)).toEqual([sooner.job.id, later.job.id]);
		expect(all.rows[0]).toMatchObject({ suburb: 'Adelaide', status: 'awaiting_payment' });
		expect(all.rows[0]!.title).toBe(sooner.job.title);
		expect(all.timeZone).toBe(ZONE);
		expect(all.more).toBe(false);

		const first = await listUpcomingFits(mine.id, { limit: 1 });
		expect(first).toMatchObject({ more: true });
		expect(first.rows.map((f) => f.jobId)).toEqual([sooner.job.id]);
		const second = await listUpcomingFits(mine.id, { limit: 1, offset: 1 });
		expect(second.rows.map((f) => f.jobId)).toEqual([later.job.id]);
		expect(second.more).toBe(false);

		const theirsListed = await listUpcomingFits(other.id, { limit: 10 });
		expect(theirsListed.rows.map((f) => f.jobId)).toEqual([theirs.job.id]);
	});

	it('drops a provisional booking once its hold has run out, and keeps a confirmed one', async () => {
		const installer = await makeInstaller();
		const held = await quotedJob(installer.id);
		expect(
			(await bookQuote(held.ownerId, held.job.id, held.quote.id, held.quote.slots[0]!.start)).ok
		).toBe(true);
		const afterHold = new Date(Date.now() + (HOLD_MINUTES + 1) * 60_000);
		expect((await listUpcomingFits(installer.id, { limit: 5 }, afterHold)).rows).toHaveLength(0);

		const paid = await quotedJob(installer.id, ADELAIDE, 2);
		const booked = await bookQuote(
			paid.ownerId,
			paid.job.id,
			paid.quote.id,
			paid.quote.slots[1]!.start
		);
		if (!booked.ok) throw new Error(booked.message);
		await confirmBooking(booked.bookingId);
		const listed = await listUpcomingFits(installer.id, { limit: 5 }, afterHold);
		expect(listed.rows.map((f) => [f.jobId, f.status])).toEqual([[paid.job.id, 'confirmed']]);
		// A fit that ended before today (in the installer's zone) is no longer upcoming.
		const afterFit = new Date(Date.parse(paid.quote.slots[1]!.end) + 2 * 86_400_000);
		expect((await listUpcomingFits(installer.id, { limit: 5 }, afterFit)).rows).toHaveLength(0);
	});
});

describe('quotes waiting for the owner’s answer', () => {
	it('lists open quotes on open jobs only, the installer’s own, until they expire', async () => {
		const mine = await makeInstaller();
		const other = await makeInstaller();
		const waiting = await quotedJob(mine.id);
		const taken = await quotedJob(mine.id);
		// The owner of the second job books another installer: this installer's quote is declined.
		const rival = await submitQuote(other.id, taken.job.id, goodQuote(pricedParts(taken.job)));
		expect(rival.ok).toBe(true);
		const [rivalQuote] = await db
			.select()
			.from(quote)
			.where(and(eq(quote.jobId, taken.job.id), eq(quote.installerId, other.id)));
		expect(
			(await bookQuote(taken.ownerId, taken.job.id, rivalQuote!.id, rivalQuote!.slots[0]!.start)).ok
		).toBe(true);
		await quotedJob(other.id, ADELAIDE, 2);

		const listed = await listQuotesAwaitingAnswer(mine.id, { limit: 10 });
		expect(listed.rows.map((q) => q.jobId)).toEqual([waiting.job.id]);
		expect(listed.rows[0]).toMatchObject({
			quoteId: waiting.quote.id,
			totalCents: waiting.quote.totalCents,
			revision: 1
		});
		const theirs = await listQuotesAwaitingAnswer(other.id, { limit: 10 });
		expect(theirs.rows.map((q) => q.jobId)).not.toContain(waiting.job.id);
		expect(theirs.rows.map((q) => q.jobId)).not.toContain(taken.job.id);

		const afterExpiry = new Date(waiting.quote.expiresAt!.getTime() + 1);
		expect((await listQuotesAwaitingAnswer(mine.id, { limit: 10 }, afterExpiry)).rows).toEqual([]);
	});
});

describe('message threads', () => {
	it('lists the installer’s threads, newest first, with who owes an answer, and no one else’s', async () => {
		const mine = await makeInstaller();
		const other = await makeInstaller();
		const first = await quotedJob(mine.id);
		const second = await quotedJob(mine.id);
		const me = { id: mine.id, role: 'installer' as const };
		expect((await postJobMessage(first.job.id, mine.id, me, 'Is the car garaged?')).ok).toBe(true);
		expect((await postJobMessage(second.job.id, mine.id, me, 'Which fuse box?')).ok).toBe(true);
		const owner = { id: first.ownerId, role: 'owner' as const };
		expect((await postJobMessage(first.job.id, mine.id, owner, 'Yes, in a carport.')).ok).toBe(
			true
		);
		// Another installer's thread on the same job stays theirs.
		const rival = await submitQuote(other.id, first.job.id, goodQuote(pricedParts(first.job)));
		expect(rival.ok).toBe(true);
		const them = { id: other.id, role: 'installer' as const };
		expect((await postJobMessage(first.job.id, other.id, them, 'Secret question')).ok).toBe(true);

		const listed = await listRecentThreads(mine.id, { limit: 10 });
		expect(listed.rows.map((t) => [t.jobId, t.ownerWroteLast, t.lastBody])).toEqual([
			[first.job.id, true, 'Yes, in a carport.'],
			[second.job.id, false, 'Which fuse box?']
		]);
		expect(JSON.stringify(listed)).not.toContain('Secret question');
		const page = await listRecentThreads(mine.id, { limit: 1 });
		expect(page.more).toBe(true);
		expect((await listRecentThreads(mine.id, { limit: 1, offset: 1 })).rows[0]?.jobId).toBe(
			second.job.id
		);
		const theirs = await listRecentThreads(other.id, { limit: 10 });
		expect(theirs.rows.map((t) => t.lastBody)).toEqual(['Secret question']);
	});
});

describe('new jobs on the day view', () => {
	// A corner of the map no other test in this file uses, so the count is this test's own.
	const FAR: LatLng = { lat: -35.6, lng: 137.6 };

	it('counts open jobs offered and not yet quoted; none for an installer not vetted', async () => {
		const vetted = await makeInstaller({ base: FAR, radiusKm: 10 });
		const applied = await makeInstaller({ base: FAR, radiusKm: 10, status: 'applied' });
		const open = await makeOpenJob(FAR);
		const quoted = await quotedJob(vetted.id, FAR);
		const day = await listNewJobsForDay(vetted.id, 5);
		expect(day.canQuote).toBe(true);
		expect(day.rows.map((j) => j.id)).toEqual([open.job.id]);
		expect(day.total).toBe(1);
		expect(day.rows.map((j) => j.id)).not.toContain(quoted.job.id);
		expect(await listNewJobsForDay(applied.id, 5)).toEqual({ rows: [], total: 0, canQuote: false });
		const whole = await getInstallerDay(vetted.id);
		expect(whole.newJobs.total).toBe(1);
		expect(whole.quotes.rows.map((q) => q.jobId)).toEqual([quoted.job.id]);
	});
});

describe('an owner starting a message', () => {
	it('may write to an installer who quoted; the installer is e-mailed', async () => {
		const installer = await makeInstaller();
		const { job: j, ownerId } = await quotedJob(installer.id);
		const before = await getOwnerThread(j.id, ownerId, installer.id);
		expect(before).toMatchObject({ ok: true, quoted: true, messages: [] });
		const sent = await postJobMessage(
			j.id,
			installer.id,
			{ id: ownerId, role: 'owner' },
			'Could you start at 8? Ring 0412 345 678.'
		);
		expect(sent).toMatchObject({ ok: true, masked: ['phone'] });
		const after = await getOwnerThread(j.id, ownerId, installer.id);
		if (!after.ok) throw new Error(after.message);
		expect(after.messages.map((m) => m.authorId)).toEqual([ownerId]);
		const mail = await db
			.select()
			.from(emailOutbox)
			.where(
				and(eq(emailOutbox.toAddress, installer.email), eq(emailOutbox.template, 'job-message'))
			);
		expect(mail).toHaveLength(1);
		expect(mail[0]?.subject).toContain('wrote to you');
		expect(mail[0]?.text).toContain('[contact details hidden]');
		expect(mail[0]?.text).not.toContain('0412 345 678');
	});

	it('is refused for an installer who did not quote, and for someone else’s job', async () => {
		const quoting = await makeInstaller();
		const bystander = await makeInstaller();
		const { job: j, ownerId } = await quotedJob(quoting.id);
		const refused = await postJobMessage(
			j.id,
			bystander.id,
			{ id: ownerId, role: 'owner' },
			'Can you quote too?'
		);
		expect(refused).toMatchObject({ ok: false, status: 403, message: OWNER_MAY_NOT_MESSAGE });
		expect(await getOwnerThread(j.id, ownerId, bystander.id)).toMatchObject({
			ok: false,
			status: 403
		});
		const stranger = await makeUser('owner');
		expect(
			await postJobMessage(j.id, quoting.id, { id: stranger.id, role: 'owner' }, 'Hello')
		).toMatchObject({ ok: false, status: 404 });
		expect(await getOwnerThread(j.id, stranger.id, quoting.id)).toMatchObject({
			ok: false,
			status: 404
		});
		expect(await getOwnerThread(j.id, ownerId, crypto.randomUUID())).toMatchObject({
			ok: false,
			status: 404
		});
		const written = await db.select().from(jobMessage).where(eq(jobMessage.jobId, j.id));
		expect(written).toEqual([]);
		const mailed = await db
			.select()
			.from(emailOutbox)
			.where(eq(emailOutbox.toAddress, bystander.email));
		expect(mailed).toEqual([]);
	});
});

describe('days off and booked fits', () => {
	it('refuses to block a day with a booked fit and blocks a free one', async () => {
		const installer = await makeInstaller();
		const made = await quotedJob(installer.id);
		const booked = await bookQuote(
			made.ownerId,
			made.job.id,
			made.quote.id,
			made.quote.slots[0]!.start
		);
		expect(booked.ok).toBe(true);
		const refused = await blockDate(installer.id, workday(0), null, ZONE);
		expect(refused).toMatchObject({
			ok: false,
			status: 409,
			fields: { day: 'A fit is booked on this day.' }
		});
		if (refused.ok) throw new Error('expected a refusal');
		expect(refused.message).toMatch(/You have a fit booked on .+ at 9:00 am/);
		expect(await blockDate(installer.id, workday(2), 'Dentist', ZONE)).toEqual({ ok: true });
		const days = await db
			.select({ day: installerBlockedDate.day })
			.from(installerBlockedDate)
			.where(eq(installerBlockedDate.installerId, installer.id));
		expect(days.map((d) => d.day)).toEqual([workday(2)]);
	});
});

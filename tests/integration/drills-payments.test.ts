// Fault drill (issue 17): the payments fake down or slow. Payments, refunds, releases and a
// cancellation (a refund and a transfer in one change) are retried after the outage and never
// duplicated: each provider object exists once (listed through the SDK) and the ledger holds one
// posting for each. "Slow" is an answer held past the SDK's timeout: the SDK's own retry carries the
// same idempotency key, so it gets back the object the first attempt made.
import { eq } from 'drizzle-orm';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { booking, ledgerTransaction, payment } from '$lib/server/db/schema';
import { findLedgerProblems, heldCents } from '$lib/server/money/ledger';
import {
	cancelPaidBooking,
	refundHeldFunds,
	releaseHeldFunds,
	retryPendingReleases,
	startHeldFundsPayment
} from '$lib/server/money/payments';
import { reconcileWithProvider } from '$lib/server/money/receipts';
import { stripe, transferGroupOf } from '$lib/server/money/stripe';
import { bookQuote } from '$lib/server/marketplace/bookings';
import {
	jobWithQuotes,
	onboardInstaller,
	paidBookingIn,
	payWith,
	startPaymentsWorld,
	SUCCESS_CARD,
	type PaymentsWorld
} from './payments-helpers';

let world: PaymentsWorld;
beforeAll(async () => {
	world = await startPaymentsWorld();
});
afterAll(() => world.close());
afterEach(async () => {
	await world.control('/fail-next', { count: 0 });
	await world.control('/slow-next', { count: 0 });
	await world.control('/slow', { ms: 0 });
	delete process.env.STRIPE_TIMEOUT_MS;
	expect(await findLedgerProblems()).toEqual([]);
	expect((await reconcileWithProvider()).driftCents).toBe(0);
});

async function paymentRow(bookingId: string) {
	const [row] = await db.select().from(payment).where(eq(payment.bookingId, bookingId));
	return row;
}
async function postings(bookingId: string, kind: string) {
	const rows = await db
		.select({ kind: ledgerTransaction.kind, reference: ledgerTransaction.reference })
		.from(ledgerTransaction)
		.where(eq(ledgerTransaction.bookingId, bookingId));
	return rows.filter((r) => r.kind === kind).map((r) => r.reference);
}
const transfersOf = async (bookingId: string) =>
	(await stripe().transfers.list({ transfer_group: transferGroupOf(bookingId) })).data;
const refundsOf = async (chargeId: string) =>
	(await stripe().refunds.list({ charge: chargeId })).data;

describe('the payments fake down', () => {
	it('opens no checkout while it is down, one afterwards, and the payment posts once', async () => {
		const world2 = await jobWithQuotes();
		const chosen = world2.quotes[0]!;
		const booked = await bookQuote(
			world2.ownerId,
			world2.job.id,
			chosen.id,
			chosen.slots[0]!.start
		);
		if (!booked.ok) throw new Error(booked.message);
		// The fake's failures say "do not retry", so each call makes one attempt.
		await world.control('/fail-next', { count: 2 });
		for (let i = 0; i < 2; i++) {
			const down = await startHeldFundsPayment(booked.bookingId);
			expect(down).toMatchObject({ status: 'unavailable' });
		}
		expect((await paymentRow(booked.bookingId))?.checkoutSessionId ?? null).toBeNull();

		const up = await startHeldFundsPayment(booked.bookingId);
		expect(up).toMatchObject({ status: 'redirect' });
		const sessionId = (await paymentRow(booked.bookingId))?.checkoutSessionId;
		if (!sessionId) throw new Error('no checkout stored');
		// A second click reuses the open checkout.
		expect(await startHeldFundsPayment(booked.bookingId)).toEqual(up);
		await onboardInstaller(chosen.installerId);
		await payWith(world, sessionId, SUCCESS_CARD);
		const [row] = await db.select().from(booking).where(eq(booking.id, booked.bookingId));
		expect(row?.status).toBe('confirmed');
		expect(await postings(booked.bookingId, 'payment')).toHaveLength(1);
		expect(await heldCents(db, booked.bookingId)).toBe(chosen.totalCents);
	});

	it('refuses a refund with 503 and moves nothing, then refunds once when it is back', async () => {
		const made = await paidBookingIn(world);
		const chargeId = (await paymentRow(made.bookingId))?.chargeId;
		await world.control('/fail-next', { count: 2 });
		for (let i = 0; i < 2; i++) {
			const down = await refundHeldFunds(made.bookingId, 2500);
			expect(!down.ok && down.status).toBe(503);
		}
		expect(await refundsOf(chargeId!)).toHaveLength(0);
		expect(await postings(made.bookingId, 'refund')).toHaveLength(0);

		const up = await refundHeldFunds(made.bookingId, 2500);
		expect(up.ok).toBe(true);
		const refunds = await refundsOf(chargeId!);
		expect(refunds.map((r) => r.amount)).toEqual([2500]);
		expect(await postings(made.bookingId, 'refund')).toEqual([refunds[0]!.id]);
		expect(await heldCents(db, made.bookingId)).toBe(made.chosen.totalCents - 2500);
	});

	it('keeps releases asked for through several schedule runs, then pays each once', async () => {
		const made = [await paidBookingIn(world), await paidBookingIn(world)];
		// One failure for each call: the two releases, then one schedule run over both.
		await world.control('/fail-next', { count: 4 });
		for (const m of made) {
			const down = await releaseHeldFunds(m.bookingId);
			expect(!down.ok && down.status).toBe(503);
		}
		expect(await retryPendingReleases()).toBe(0);
		for (const m of made) {
			expect(await transfersOf(m.bookingId)).toHaveLength(0);
			expect((await paymentRow(m.bookingId))?.lastReleaseError).toBeTruthy();
		}
		await world.control('/fail-next', { count: 0 });
		expect(await retryPendingReleases()).toBe(2);
		expect(await retryPendingReleases()).toBe(0);
		for (const m of made) {
			const transfers = await transfersOf(m.bookingId);
			expect(transfers).toHaveLength(1);
			expect(await postings(m.bookingId, 'release')).toEqual([transfers[0]!.id]);
			expect(await heldCents(db, m.bookingId)).toBe(0);
		}
	});

	it('cancels late once when the refund went through but the late-fee transfer failed', async () => {
		const made = await paidBookingIn(world);
		const chargeId = (await paymentRow(made.bookingId))?.chargeId;
		const [b] = await db.select().from(booking).where(eq(booking.id, made.bookingId));
		const at = new Date(b!.slotStart.getTime() - 3_600_000);
		// The refund passes; the transfer fails, so the change rolls back.
		await world.control('/fail-next', { count: 1, skip: 1 });
		const half = await cancelPaidBooking(made.bookingId, 'owner', made.ownerId, at);
		expect(!half.ok && half.status).toBe(503);
		// The provider made the refund although the change rolled back (its charge.refunded event
		// may post it to the ledger meanwhile); the booking itself is not cancelled.
		expect(await refundsOf(chargeId!)).toHaveLength(1);
		const [still] = await db.select().from(booking).where(eq(booking.id, made.bookingId));
		expect(still?.status).toBe('confirmed');

		// The owner tries again: the refund is not made twice, the fee is paid once.
		const done = await cancelPaidBooking(made.bookingId, 'owner', made.ownerId, at);
		expect(done.ok && done.lateFeeCents).toBe(5000);
		const refunds = await refundsOf(chargeId!);
		expect(refunds.map((r) => r.amount)).toEqual([made.chosen.totalCents - 5000]);
		expect((await transfersOf(made.bookingId)).map((t) => t.amount)).toEqual([5000]);
		// Posted once: by the retry (the key's replay) or, when the provider's charge.refunded for
		// the first attempt came first, by the webhook; the retry then finds nothing left to refund.
		expect(await postings(made.bookingId, 'refund')).toHaveLength(1);
		expect(await postings(made.bookingId, 'late_fee')).toHaveLength(1);
		expect(await heldCents(db, made.bookingId)).toBe(0);
	});
});

describe('the payments fake slow to answer', () => {
	it('releases once when the answer comes after the SDK’s timeout (its retry replays the key)', async () => {
		const made = await paidBookingIn(world);
		process.env.STRIPE_TIMEOUT_MS = '1000';
		await world.control('/slow-next', { count: 1, ms: 3000 });
		const released = await releaseHeldFunds(made.bookingId);
		expect(released.ok && !released.alreadyReleased).toBe(true);
		const transfers = await transfersOf(made.bookingId);
		expect(transfers).toHaveLength(1);
		expect(released.ok && released.transferId).toBe(transfers[0]!.id);
		expect(await postings(made.bookingId, 'release')).toEqual([transfers[0]!.id]);
	});

	it('refunds once when the answer comes after the SDK’s timeout', async () => {
		const made = await paidBookingIn(world);
		const chargeId = (await paymentRow(made.bookingId))?.chargeId;
		process.env.STRIPE_TIMEOUT_MS = '1000';
		await world.control('/slow-next', { count: 1, ms: 3000 });
		const refunded = await refundHeldFunds(made.bookingId, 1500);
		expect(refunded.ok).toBe(true);
		const refunds = await refundsOf(chargeId!);
		expect(refunds.map((r) => r.amount)).toEqual([1500]);
		expect(await postings(made.bookingId, 'refund')).toEqual([refunds[0]!.id]);
	});

	it('answers 503 when every attempt times out, and the schedule’s later runs pay once', async () => {
		const made = await paidBookingIn(world);
		process.env.STRIPE_TIMEOUT_MS = '1000';
		// Slow before doing the work: both attempts of the call time out unanswered.
		await world.control('/slow', { ms: 2500 });
		const timedOut = await releaseHeldFunds(made.bookingId);
		await world.control('/slow', { ms: 0 });
		expect(!timedOut.ok && timedOut.status).toBe(503);
		expect(await postings(made.bookingId, 'release')).toHaveLength(0);
		expect((await paymentRow(made.bookingId))?.releaseRequestedAt).toBeInstanceOf(Date);

		// The schedule runs again until the provider has finished what it held (a run meanwhile
		// finds the key busy, 409, and leaves the release asked for).
		let released = 0;
		const deadline = Date.now() + 20_000;
		while (released === 0 && Date.now() < deadline) {
			released = await retryPendingReleases();
			if (released === 0) await new Promise((r) => setTimeout(r, 250));
		}
		expect(released).toBe(1);
		expect(await retryPendingReleases()).toBe(0);
		const transfers = await transfersOf(made.bookingId);
		expect(transfers).toHaveLength(1);
		expect(await postings(made.bookingId, 'release')).toEqual([transfers[0]!.id]);
	});
});

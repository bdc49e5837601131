import { and, eq, sql } from 'drizzle-orm';
import Stripe from 'stripe';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { lapseExpiredHolds, bookQuote } from '$lib/server/marketplace/bookings';
import { db } from '$lib/server/db';
import {
	booking,
	emailOutbox,
	installerProfile,
	job,
	ledgerEntry,
	ledgerTransaction,
	notice,
	payment,
	quote
} from '$lib/server/db/schema';
import { findLedgerProblems, heldCents, reverseLedgerTransaction } from '$lib/server/money/ledger';
import {
	cancelPaidBooking,
	receivePaymentWebhook,
	refundHeldFunds,
	releaseHeldFunds,
	retryPendingReleases
} from '$lib/server/money/payments';
import { reconcileWithProvider } from '$lib/server/money/receipts';
import { stripe, transferGroupOf } from '$lib/server/money/stripe';
import { submitQuote } from '$lib/server/marketplace/quotes';
import { PAYOUTS_NEEDED_TEXT } from '$lib/labels';
import {
	ADELAIDE,
	goodQuote,
	makeInstaller,
	makeOpenJob,
	makeUser,
	pricedParts
} from './matching-helpers';
import {
	defaultMarketSettings,
	getMarketSettings,
	updateMarketSettings
} from '$lib/server/money/settings';
import { adminAudit } from '$lib/server/db/schema';
import {
	bookAndOpenCheckout,
	onboardInstaller,
	openCheckout,
	payWith,
	startPaymentsWorld,
	WEBHOOK_SECRET,
	type PaymentsWorld
} from './payments-helpers';

const SUCCESS = '4242424242424242';
const DECLINE = '4000000000000002';
const INSUFFICIENT = '4000000000009995';
const AUTHENTICATE = '4000002500003155';

let world: PaymentsWorld;

beforeAll(async () => {
	world = await startPaymentsWorld();
});
afterAll(() => world.close());

// The ledger invariant, after every test: each transaction sums to zero with two or more
// entries, and no booking holds a negative amount.
afterEach(async () => {
	expect(await findLedgerProblems()).toEqual([]);
});

async function bookingRow(id: string) {
	const [row] = await db.select().from(booking).where(eq(booking.id, id));
	return row!;
}
async function paymentRow(id: string) {
	const [row] = await db.select().from(payment).where(eq(payment.bookingId, id));
	return row!;
}
async function mails(template: string, to?: string) {
	return db
		.select()
		.from(emailOutbox)
		.where(and(eq(emailOutbox.template, template), to ? eq(emailOutbox.toAddress, to) : undefined));
}
async function ledgerKinds(bookingId: string) {
	const rows = await db
		.select({ kind: ledgerTransaction.kind })
		.from(ledgerTransaction)
		.where(eq(ledgerTransaction.bookingId, bookingId));
	return rows.map((r) => r.kind).sort();
}

/** A paid, confirmed booking whose installer has onboarded in the fake. */
async function paidBooking() {
	const made = await bookAndOpenCheckout();
	await onboardInstaller(made.chosen.installerId);
	await payWith(world, made.sessionId, SUCCESS);
	expect((await bookingRow(made.bookingId)).status).toBe('confirmed');
	return made;
}

describe('paying a booking into held funds', () => {
	it('confirms the booking on the signed event, holds the total in the ledger and tells both sides', async () => {
		const made = await bookAndOpenCheckout();
		const session = await stripe().checkout.sessions.retrieve(made.sessionId);
		expect(session.amount_total).toBe(made.chosen.totalCents);
		expect(session.currency).toBe('aud');

		await payWith(world, made.sessionId, SUCCESS);

		expect((await bookingRow(made.bookingId)).status).toBe('confirmed');
		expect(await heldCents(db, made.bookingId)).toBe(made.chosen.totalCents);
		const paid = await paymentRow(made.bookingId);
		expect(paid.paidAt).toBeInstanceOf(Date);
		expect(paid.lastProblem).toBeNull();
		const charge = await stripe().charges.retrieve(paid.chargeId!);
		expect(charge.transfer_group).toBe(transferGroupOf(made.bookingId));
		expect(charge.amount).toBe(made.chosen.totalCents);
		expect(await ledgerKinds(made.bookingId)).toEqual(['payment']);

		expect(await mails('payment-confirmed-owner')).toEqual(
			expect.arrayContaining([
				expect.objectContaining({ text: expect.stringContaining('your booking is confirmed') })
			])
		);
		const installerMail = await mails('payment-confirmed-installer');
		expect(installerMail.some((m) => m.text.includes('1 Secret Street, Adelaide'))).toBe(true);
		const notices = await db
			.select()
			.from(notice)
			.where(eq(notice.link, `/owner/bookings/${made.bookingId}`));
		expect(notices).toHaveLength(1);
	});

	it('keeps a declined card as the reason on the booking, and a retry with a good card confirms it', async () => {
		const made = await bookAndOpenCheckout();
		await payWith(world, made.sessionId, DECLINE);
		expect((await bookingRow(made.bookingId)).status).toBe('awaiting_payment');
		expect((await paymentRow(made.bookingId)).lastProblem).toBe('Your card was declined.');
		await payWith(world, made.sessionId, INSUFFICIENT);
		expect((await paymentRow(made.bookingId)).lastProblem).toBe(
			'Your card has insufficient funds.'
		);
		expect(await ledgerKinds(made.bookingId)).toEqual([]);

		// The owner tries again: the same open checkout is offered, and a good card goes through.
		expect(await openCheckout(made.bookingId)).toBe(made.sessionId);
		await payWith(world, made.sessionId, SUCCESS);
		expect((await bookingRow(made.bookingId)).status).toBe('confirmed');
		expect((await paymentRow(made.bookingId)).lastProblem).toBeNull();
	});

	it('reports a failed authentication (the card that asks for it) in the provider’s words', async () => {
		const made = await bookAndOpenCheckout();
		await payWith(world, made.sessionId, AUTHENTICATE);
		expect((await paymentRow(made.bookingId)).lastProblem).toMatch(
			/unable to authenticate your payment method/
		);
		expect((await bookingRow(made.bookingId)).status).toBe('awaiting_payment');
	});
});

describe('webhooks', () => {
	it('processes each event once when the provider sends it twice, and again on demand', async () => {
		const made = await bookAndOpenCheckout();
		const owner = (await mails('payment-confirmed-owner')).length;
		await world.control('/duplicate-next', { count: 5 });
		await payWith(world, made.sessionId, SUCCESS);
		const completed = (await world.deliveries()).filter(
			(d) => d.type === 'checkout.session.completed'
		);
		const last = completed.at(-1)!;
		expect(completed.filter((d) => d.eventId === last.eventId)).toHaveLength(2);
		expect(completed.filter((d) => d.eventId === last.eventId).every((d) => d.status === 200)).toBe(
			true
		);
		// Re-sent on demand: answered 200, changes nothing.
		await world.control(`/events/${last.eventId}/resend`);
		expect(await ledgerKinds(made.bookingId)).toEqual(['payment']);
		expect(await heldCents(db, made.bookingId)).toBe(made.chosen.totalCents);
		expect((await mails('payment-confirmed-owner')).length).toBe(owner + 1);
	});

	it('refuses an unsigned event, a wrong signature and a stale one with 400', async () => {
		const payload = JSON.stringify({
			id: 'evt_forged',
			object: 'event',
			type: 'balance.available',
			data: { object: {} }
		});
		expect((await receivePaymentWebhook(payload, null)).status).toBe(400);
		const wrong = stripe().webhooks.generateTestHeaderString({ payload, secret: 'whsec_wrong' });
		expect((await receivePaymentWebhook(payload, wrong)).status).toBe(400);
		const stale = stripe().webhooks.generateTestHeaderString({
			payload,
			secret: WEBHOOK_SECRET,
			timestamp: Math.floor(Date.now() / 1000) - 600
		});
		const answer = await receivePaymentWebhook(payload, stale);
		expect(answer.status).toBe(400);
		expect(answer.message).toMatch(/tolerance/i);
		// An hour ahead is refused too: the tolerance holds in both directions.
		const ahead = stripe().webhooks.generateTestHeaderString({
			payload,
			secret: WEBHOOK_SECRET,
			timestamp: Math.floor(Date.now() / 1000) + 3600
		});
		const early = await receivePaymentWebhook(payload, ahead);
		expect(early.status).toBe(400);
		expect(early.message).toMatch(/tolerance/i);
		// The same body signed now is accepted (so the refusals above were about the signature).
		const good = stripe().webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET });
		const rows = await db.execute(sql`select 1 from payment_event where event_id = 'evt_forged'`);
		expect(rows.rows).toHaveLength(0);
		expect((await receivePaymentWebhook(payload, good)).status).toBe(200);
	});

	it('ignores a failure reported after the success (events out of order)', async () => {
		const made = await bookAndOpenCheckout();
		await payWith(world, made.sessionId, DECLINE);
		const failed = (await world.deliveries()).filter(
			(d) => d.type === 'payment_intent.payment_failed'
		);
		const failure = failed.at(-1)!;
		await payWith(world, made.sessionId, SUCCESS);
		// A copy of the failure arrives late (a new delivery of an event the app has seen), and
		// one the app never saw: neither undoes the confirmation.
		await world.control(`/events/${failure.eventId}/resend`);
		const event = await stripe().events.retrieve(failure.eventId);
		const copy = JSON.stringify({ ...event, id: `${event.id}_late` });
		const signed = stripe().webhooks.generateTestHeaderString({
			payload: copy,
			secret: WEBHOOK_SECRET
		});
		expect((await receivePaymentWebhook(copy, signed)).message).toBe('processed');
		expect((await bookingRow(made.bookingId)).status).toBe('confirmed');
		expect((await paymentRow(made.bookingId)).lastProblem).toBeNull();
	});

	it('retries a delivery the app did not answer with 2xx, with back-off', async () => {
		const made = await bookAndOpenCheckout();
		// Point the fake at a port nobody listens on, pay, then point it back: the retries land.
		const hookUrl = `http://127.0.0.1:${String((world.hook.address() as { port: number }).port)}/`;
		await world.control('/webhook', { url: 'http://127.0.0.1:9/', secret: WEBHOOK_SECRET });
		await payWith(world, made.sessionId, SUCCESS);
		expect((await bookingRow(made.bookingId)).status).toBe('awaiting_payment');
		await world.control('/webhook', { url: hookUrl, secret: WEBHOOK_SECRET });
		await expect
			.poll(async () => (await bookingRow(made.bookingId)).status, { timeout: 10_000 })
			.toBe('confirmed');
		const attempts = (await world.deliveries()).filter(
			(d) => d.type === 'checkout.session.completed' && d.status === null
		);
		expect(attempts.length).toBeGreaterThan(0);
	});
});

describe('paid after the hold lapsed', () => {
	it('revives the booking when the slot and the job are still free', async () => {
		const made = await bookAndOpenCheckout(1);
		const later = new Date(Date.now() + 40 * 60_000);
		expect(await lapseExpiredHolds({ jobId: made.job.id }, later)).toBe(1);
		await payWith(world, made.sessionId, SUCCESS);
		expect((await bookingRow(made.bookingId)).status).toBe('confirmed');
		const [j] = await db.select().from(job).where(eq(job.id, made.job.id));
		expect(j?.status).toBe('booked');
		expect(await heldCents(db, made.bookingId)).toBe(made.chosen.totalCents);
		const owner = await mails('payment-confirmed-owner');
		expect(owner.some((m) => m.text.includes('the time was still free'))).toBe(true);
	});

	it('refunds in full when someone else booked the job meanwhile, and says why', async () => {
		const made = await bookAndOpenCheckout(1);
		const later = new Date(Date.now() + 40 * 60_000);
		await lapseExpiredHolds({ jobId: made.job.id }, later);
		// The owner books again (the other time), before the first payment lands.
		const rebooked = await bookQuote(
			made.ownerId,
			made.job.id,
			made.chosen.id,
			made.chosen.slots[1]!.start,
			later
		);
		expect(rebooked.ok).toBe(true);

		await payWith(world, made.sessionId, SUCCESS);

		expect((await bookingRow(made.bookingId)).status).toBe('lapsed');
		expect(await heldCents(db, made.bookingId)).toBe(0);
		expect(await ledgerKinds(made.bookingId)).toEqual(['payment', 'refund']);
		const paid = await paymentRow(made.bookingId);
		expect(paid.refundedAfterLapseAt).toBeInstanceOf(Date);
		const charge = await stripe().charges.retrieve(paid.chargeId!);
		expect(charge.amount_refunded).toBe(made.chosen.totalCents);
		expect(
			(await mails('payment-refunded-after-lapse')).some((m) => m.text.includes('no longer free'))
		).toBe(true);
	});
});

describe('releasing held funds', () => {
	it('transfers the total less the fee, with the booking’s transfer group, exactly once under 50 parallel calls', async () => {
		const made = await paidBooking();
		const total = made.chosen.totalCents;
		const results = await Promise.all(
			Array.from({ length: 50 }, () => releaseHeldFunds(made.bookingId))
		);
		const fresh = results.filter((r) => r.ok && !r.alreadyReleased);
		expect(fresh).toHaveLength(1);
		expect(results.every((r) => r.ok)).toBe(true);
		const transfers = await stripe().transfers.list({
			transfer_group: transferGroupOf(made.bookingId)
		});
		expect(transfers.data).toHaveLength(1);
		// Fee rule of the payments issue at the default settings: 10 %, at least $15.00.
		const fee = Math.max(1500, Math.round(total / 10));
		expect(transfers.data[0]!.amount).toBe(total - fee);
		const [profile] = await db
			.select()
			.from(installerProfile)
			.where(eq(installerProfile.userId, made.chosen.installerId));
		expect(transfers.data[0]!.destination).toBe(profile!.payoutAccountId);
		expect(await heldCents(db, made.bookingId)).toBe(0);
		const paid = await paymentRow(made.bookingId);
		expect(paid.feeCents).toBe(fee);
		// ATO: GST is 1/11 of a GST-inclusive price.
		expect(paid.gstOnFeeCents).toBe(Math.round(fee / 11));
		expect(await ledgerKinds(made.bookingId)).toEqual(['payment', 'release']);
	});

	it('keeps the request when the provider is down, pays nothing, and the retry pays once', async () => {
		const made = await paidBooking();
		await world.control('/fail-next', { count: 3, status: 500 });
		const failed = await releaseHeldFunds(made.bookingId);
		expect(failed.ok).toBe(false);
		expect(!failed.ok && failed.status).toBe(503);
		const pending = await paymentRow(made.bookingId);
		expect(pending.releaseRequestedAt).toBeInstanceOf(Date);
		expect(pending.releasedAt).toBeNull();
		expect(pending.lastReleaseError).toBeTruthy();
		expect(await heldCents(db, made.bookingId)).toBe(made.chosen.totalCents);
		await world.control('/fail-next', { count: 0 });

		expect(await retryPendingReleases()).toBeGreaterThanOrEqual(1);
		expect(await retryPendingReleases()).toBe(0);
		const transfers = await stripe().transfers.list({
			transfer_group: transferGroupOf(made.bookingId)
		});
		expect(transfers.data).toHaveLength(1);
		expect((await paymentRow(made.bookingId)).releasedAt).toBeInstanceOf(Date);
	});

	it('refuses to pay out an unpaid booking', async () => {
		const made = await bookAndOpenCheckout();
		const result = await releaseHeldFunds(made.bookingId);
		expect(result.ok).toBe(false);
		expect(!result.ok && result.status).toBe(409);
	});
});

describe('refunds and cancellation', () => {
	it('refunds part, then refuses a refund larger than what is left (ledger and provider alike)', async () => {
		const made = await paidBooking();
		const total = made.chosen.totalCents;
		const part = await refundHeldFunds(made.bookingId, 1000);
		expect(part.ok && part.heldCents).toBe(total - 1000);
		const tooMuch = await refundHeldFunds(made.bookingId, total);
		expect(tooMuch.ok).toBe(false);
		expect(!tooMuch.ok && tooMuch.message).toContain('more than the booking holds');
		// The provider says the same on its own.
		const paid = await paymentRow(made.bookingId);
		await expect(
			stripe().refunds.create({ charge: paid.chargeId!, amount: total })
		).rejects.toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
		expect(await heldCents(db, made.bookingId)).toBe(total - 1000);
		const rest = await refundHeldFunds(made.bookingId, total - 1000);
		expect(rest.ok && rest.heldCents).toBe(0);
	});

	it('refunds an owner in full more than 48 hours ahead and withdraws the job', async () => {
		const made = await paidBooking();
		const b = await bookingRow(made.bookingId);
		const at = new Date(b.slotStart.getTime() - 72 * 3_600_000);
		const result = await cancelPaidBooking(made.bookingId, 'owner', made.ownerId, at);
		expect(result.ok && result.refundCents).toBe(made.chosen.totalCents);
		expect(result.ok && result.lateFeeCents).toBe(0);
		expect((await bookingRow(made.bookingId)).status).toBe('cancelled');
		expect(await heldCents(db, made.bookingId)).toBe(0);
		const [j] = await db.select().from(job).where(eq(job.id, made.job.id));
		expect(j?.status).toBe('withdrawn');
	});

	it('pays the late fee to the installer when the owner cancels later', async () => {
		const made = await paidBooking();
		const b = await bookingRow(made.bookingId);
		const at = new Date(b.slotStart.getTime() - 3_600_000);
		const result = await cancelPaidBooking(made.bookingId, 'owner', made.ownerId, at);
		expect(result.ok && result.lateFeeCents).toBe(5000);
		expect(result.ok && result.refundCents).toBe(made.chosen.totalCents - 5000);
		const transfers = await stripe().transfers.list({
			transfer_group: transferGroupOf(made.bookingId)
		});
		expect(transfers.data.map((t) => t.amount)).toEqual([5000]);
		expect(await heldCents(db, made.bookingId)).toBe(0);
	});

	it('refunds in full and re-opens the job when the installer cancels', async () => {
		const made = await paidBooking();
		const result = await cancelPaidBooking(made.bookingId, 'installer', made.chosen.installerId);
		expect(result.ok && result.refundCents).toBe(made.chosen.totalCents);
		const [j] = await db.select().from(job).where(eq(job.id, made.job.id));
		expect(j?.status).toBe('collecting_quotes');
		const [q] = await db.select().from(quote).where(eq(quote.id, made.chosen.id));
		expect(q?.status).toBe('withdrawn');
		// Someone else's booking is not theirs to cancel.
		const again = await cancelPaidBooking(made.bookingId, 'owner', made.chosen.installerId);
		expect(!again.ok && again.status).toBe(404);
	});
});

describe('an admin moving money by hand', () => {
	it('audits a release and a refund with who, why, before and after, in the same transaction', async () => {
		const admin = await makeUser('owner', 'money-admin');
		const refunded = await paidBooking();
		const total = refunded.chosen.totalCents;
		const refund = await refundHeldFunds(refunded.bookingId, 1000, {
			adminId: admin.id,
			reason: 'Goodwill for a late start'
		});
		expect(refund.ok).toBe(true);
		const released = await paidBooking();
		const release = await releaseHeldFunds(released.bookingId, new Date(), {
			adminId: admin.id,
			reason: 'Owner confirmed by phone'
		});
		expect(release.ok).toBe(true);
		const rows = await db
			.select()
			.from(adminAudit)
			.where(eq(adminAudit.actorId, admin.id))
			.orderBy(adminAudit.createdAt);
		expect(rows.map((r) => [r.action, r.reason])).toEqual([
			['refund', 'Goodwill for a late start'],
			['release', 'Owner confirmed by phone']
		]);
		expect(rows[0]!.before).toEqual({ bookingId: refunded.bookingId, heldCents: total });
		expect(rows[0]!.after).toEqual({
			bookingId: refunded.bookingId,
			heldCents: total - 1000,
			refundCents: 1000
		});
		expect(rows[0]!.targetUserId).toBe(refunded.ownerId);
		expect(rows[1]!.targetUserId).toBe(released.chosen.installerId);
		// A refused refund writes no audit row.
		const refused = await refundHeldFunds(refunded.bookingId, total * 10, {
			adminId: admin.id,
			reason: 'Too much'
		});
		expect(refused.ok).toBe(false);
		expect(await db.select().from(adminAudit).where(eq(adminAudit.actorId, admin.id))).toHaveLength(
			2
		);
	});
});

describe('payouts set-up', () => {
	it('lets an installer quote only once payouts are enabled through onboarding', async () => {
		const installer = await makeInstaller({ base: ADELAIDE, payoutsEnabled: false });
		const { job: j } = await makeOpenJob(ADELAIDE);
		const refused = await submitQuote(installer.id, j.id, goodQuote(pricedParts(j)));
		expect(refused.ok).toBe(false);
		expect(!refused.ok && refused.message).toBe(PAYOUTS_NEEDED_TEXT);

		const back = await onboardInstaller(installer.id);
		expect(back).toMatch(/\/installer\/payouts\?returned=1$/);
		const [profile] = await db
			.select()
			.from(installerProfile)
			.where(eq(installerProfile.userId, installer.id));
		expect(profile?.payoutAccountId).toMatch(/^acct_/);
		expect(profile?.payoutsEnabled).toBe(true);
		expect((await submitQuote(installer.id, j.id, goodQuote(pricedParts(j)))).ok).toBe(true);
	});
});

describe('the ledger', () => {
	it('refuses changes and deletions, refuses an unbalanced transaction, and corrects by reversal', async () => {
		const made = await paidBooking();
		const [entry] = await db
			.select()
			.from(ledgerEntry)
			.where(eq(ledgerEntry.bookingId, made.bookingId));
		await expect(
			db.update(ledgerEntry).set({ amountCents: 1 }).where(eq(ledgerEntry.id, entry!.id))
		).rejects.toThrow();
		await expect(db.delete(ledgerEntry).where(eq(ledgerEntry.id, entry!.id))).rejects.toThrow();
		await expect(
			db.transaction(async (tx) => {
				const [t] = await tx
					.insert(ledgerTransaction)
					.values({ kind: 'reversal', bookingId: null, reference: 'unbalanced', memo: 'test' })
					.returning();
				await tx
					.insert(ledgerEntry)
					.values({ transactionId: t!.id, account: 'platform_cash', amountCents: 5 });
			})
		).rejects.toThrow();

		await db.transaction((tx) => reverseLedgerTransaction(tx, entry!.transactionId, 'test'));
		expect(await heldCents(db, made.bookingId)).toBe(0);
		// Put it back so the reconciliation below still agrees with the provider.
		const [reversal] = await db
			.select()
			.from(ledgerTransaction)
			.where(eq(ledgerTransaction.reverses, entry!.transactionId));
		await db.transaction((tx) => reverseLedgerTransaction(tx, reversal!.id, 'undo test'));
		expect(await heldCents(db, made.bookingId)).toBe(made.chosen.totalCents);
	});

	it('reconciles with the provider’s balance (no drift after everything above)', async () => {
		const r = await reconcileWithProvider();
		expect(r.ledgerCashCents).toBeGreaterThan(0);
		expect(r.driftCents).toBe(0);
	});
});

describe('market settings an admin changes', () => {
	it('are audited, and the next release and late cancellation use them', async () => {
		const admin = await makeUser('owner', 'settings-admin');
		const start = await getMarketSettings();
		expect(start).toEqual(defaultMarketSettings());
		const next = {
			...start,
			feePercentBasisPoints: 2000,
			feeMinimumCents: 3000,
			lateCancelFeeCents: 8000
		};
		const saved = await updateMarketSettings(admin.id, next, 'Trial of a higher fee');
		expect(saved.changed.sort()).toEqual(
			['feeMinimumCents', 'feePercentBasisPoints', 'lateCancelFeeCents'].sort()
		);
		expect((await updateMarketSettings(admin.id, next, 'Same again')).changed).toEqual([]);
		const [entry] = await db
			.select()
			.from(adminAudit)
			.where(and(eq(adminAudit.actorId, admin.id), eq(adminAudit.action, 'settings')));
		expect(entry?.before).toMatchObject({ feePercentBasisPoints: start.feePercentBasisPoints });
		expect(entry?.after).toMatchObject({ feePercentBasisPoints: 2000, lateCancelFeeCents: 8000 });
		try {
			const released = await paidBooking();
			const total = released.chosen.totalCents;
			expect((await releaseHeldFunds(released.bookingId)).ok).toBe(true);
			// The fee rule with the new settings: 20 %, at least $30.00.
			const fee = Math.max(3000, Math.round(total / 5));
			expect((await paymentRow(released.bookingId)).feeCents).toBe(fee);
			const late = await paidBooking();
			const b = await bookingRow(late.bookingId);
			const at = new Date(b.slotStart.getTime() - 3_600_000);
			const result = await cancelPaidBooking(late.bookingId, 'owner', late.ownerId, at);
			expect(result.ok && result.lateFeeCents).toBe(8000);
		} finally {
			await updateMarketSettings(admin.id, start, 'Back to the starting values');
		}
		expect(await getMarketSettings()).toEqual(start);
	});
});

/**
 * Reading held funds: owners' receipts and payment history, installers' payout statements and
 * payout history, the admins' list and the reconciliation of the ledger with the provider's
 * balance. Read only; amounts come from the ledger.
 */
import { and, desc, eq, isNotNull, sql } from 'drizzle-orm';
import { releaseSplit } from '$lib/money/fees';
import { db } from '../db';
import { booking, installerProfile, job, payment, quote, user } from '../db/schema';
import { accountBalance, heldCents, listBookingLedger } from './ledger';
import { stripe } from './stripe';
import { feeOf, getMarketSettings } from './settings';

/** A booking's payment as its owner or installer sees it, or null when it is not theirs. */
async function bookingMoney(bookingId: string, who: { ownerId?: string; installerId?: string }) {
	const [row] = await db
		.select({
			booking,
			payment,
			title: job.title,
			timeZone: job.timeZone,
			businessName: installerProfile.businessName,
			abn: installerProfile.abn,
			gstRegistered: quote.gstRegistered,
			gstCents: quote.gstCents,
			ownerName: user.displayName
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(quote, eq(quote.id, booking.quoteId))
		.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
		.innerJoin(user, eq(user.id, booking.ownerId))
		.leftJoin(payment, eq(payment.bookingId, booking.id))
		.where(
			and(
				eq(booking.id, bookingId),
				who.ownerId ? eq(booking.ownerId, who.ownerId) : undefined,
				who.installerId ? eq(booking.installerId, who.installerId) : undefined
			)
		);
	if (!row) return null;
	const [ledger, held] = await Promise.all([
		listBookingLedger(bookingId),
		heldCents(db, bookingId)
	]);
	// One line per ledger transaction: what it did to the booking's held funds.
	const lines = new Map<
		string,
		{ kind: string; memo: string; at: Date; heldChangeCents: number }
	>();
	for (const e of ledger) {
		const line = lines.get(e.id) ?? {
			kind: e.kind,
			memo: e.memo,
			at: e.createdAt,
			heldChangeCents: 0
		};
		if (e.account === 'owner_funds_held') line.heldChangeCents -= e.amountCents;
		lines.set(e.id, line);
	}
	return { ...row, heldCents: held, lines: [...lines.values()] };
}

/** The owner's receipt for a paid booking; null when it is not theirs or not paid. */
export async function getOwnerReceipt(bookingId: string, ownerId: string) {
	const money = await bookingMoney(bookingId, { ownerId });
	return money?.payment?.paidAt ? money : null;
}

/**
 * The installer's payout statement for a booking: the total, Tapline's fee with its GST (the fee
 * invoice) and the payout; before release, what the release would be at today's fee settings.
 */
export async function getPayoutStatement(bookingId: string, installerId: string) {
	const money = await bookingMoney(bookingId, { installerId });
	if (!money?.payment?.paidAt) return null;
	const p = money.payment;
	const released = p.releasedAt !== null;
	const split = released
		? {
				totalCents: (p.payoutCents ?? 0) + (p.feeCents ?? 0),
				feeCents: p.feeCents ?? 0,
				gstOnFeeCents: p.gstOnFeeCents ?? 0,
				payoutCents: p.payoutCents ?? 0
			}
		: money.heldCents > 0
			? releaseSplit(money.heldCents, feeOf(await getMarketSettings()))
			: null;
	return { ...money, released, split };
}

/** An owner's payments, newest first. */
export async function listOwnerPayments(ownerId: string) {
	return db
		.select({
			bookingId: booking.id,
			title: job.title,
			businessName: installerProfile.businessName,
			status: booking.status,
			totalCents: booking.totalCents,
			paidAt: payment.paidAt,
			refundedAfterLapseAt: payment.refundedAfterLapseAt,
			heldCents: sql<number>`coalesce((select -sum(e.amount_cents) from ledger_entry e where e.booking_id = ${booking.id} and e.account = 'owner_funds_held'), 0)::int`
		})
		.from(payment)
		.innerJoin(booking, eq(booking.id, payment.bookingId))
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
		.where(and(eq(booking.ownerId, ownerId), isNotNull(payment.paidAt)))
		.orderBy(desc(payment.paidAt))
		.limit(100);
}

/** An installer's paid bookings and payouts, newest first. */
export async function listInstallerPayouts(installerId: string) {
	return db
		.select({
			bookingId: booking.id,
			title: job.title,
			slotStart: booking.slotStart,
			status: booking.status,
			totalCents: booking.totalCents,
			paidAt: payment.paidAt,
			releasedAt: payment.releasedAt,
			feeCents: payment.feeCents,
			payoutCents: payment.payoutCents
		})
		.from(payment)
		.innerJoin(booking, eq(booking.id, payment.bookingId))
		.innerJoin(job, eq(job.id, booking.jobId))
		.where(and(eq(booking.installerId, installerId), isNotNull(payment.paidAt)))
		.orderBy(desc(payment.paidAt))
		.limit(100);
}

/** Paid bookings for the admins, newest first, with what each holds. */
export async function listPaidBookingsForAdmin() {
	return db
		.select({
			bookingId: booking.id,
			title: job.title,
			businessName: installerProfile.businessName,
			status: booking.status,
			totalCents: booking.totalCents,
			paidAt: payment.paidAt,
			releasedAt: payment.releasedAt,
			lastReleaseError: payment.lastReleaseError,
			heldCents: sql<number>`coalesce((select -sum(e.amount_cents) from ledger_entry e where e.booking_id = ${booking.id} and e.account = 'owner_funds_held'), 0)::int`
		})
		.from(payment)
		.innerJoin(booking, eq(booking.id, payment.bookingId))
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
		.where(isNotNull(payment.paidAt))
		.orderBy(desc(payment.paidAt))
		.limit(50);
}

/** The ledger's cash against the provider's available balance (Australian dollars). */
export interface Reconciliation {
	ledgerCashCents: number;
	providerCents: number;
	driftCents: number;
	heldCents: number;
	feeRevenueCents: number;
	gstPayableCents: number;
}

/**
 * Compares what the ledger says the platform holds at the provider (`platform_cash`) with the
 * provider's balance; any difference is drift to look into. The provider here charges no
 * processing fees; against the real one, its fees would be a ledger account of their own.
 */
export async function reconcileWithProvider(): Promise<Reconciliation> {
	const [cash, held, fees, gst, balance] = await Promise.all([
		accountBalance('platform_cash'),
		accountBalance('owner_funds_held'),
		accountBalance('fee_revenue'),
		accountBalance('gst_payable'),
		stripe().balance.retrieve()
	]);
	const provider = [...balance.available, ...balance.pending]
		.filter((b) => b.currency === 'aud')
		.reduce((sum, b) => sum + b.amount, 0);
	return {
		ledgerCashCents: cash,
		providerCents: provider,
		driftCents: provider - cash,
		heldCents: -held,
		feeRevenueCents: -fees,
		gstPayableCents: -gst
	};
}

/** Where a booking's payment stands, for its page (no ownership check: the caller did it). */
export async function getPaymentState(bookingId: string) {
	const [row] = await db
		.select({
			paidAt: payment.paidAt,
			lastProblem: payment.lastProblem,
			refundedAfterLapseAt: payment.refundedAfterLapseAt,
			releasedAt: payment.releasedAt
		})
		.from(payment)
		.where(eq(payment.bookingId, bookingId));
	return {
		...(row ?? { paidAt: null, lastProblem: null, refundedAfterLapseAt: null, releasedAt: null }),
		heldCents: await heldCents(db, bookingId)
	};
}

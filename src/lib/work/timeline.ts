/**
 * A booking's timeline for admins: what the booking, its payment, its ledger and the job's
 * messages between its owner and installer say happened, merged into one list in time order.
 * Bookings keep no history of status changes, so only what has a time of its own is an entry:
 * the booking made, the end of its hold, each payment step, each event from the payment provider
 * about it, each ledger transaction, each message, and the work's own steps: each fit report, the
 * acceptance of the work, and each step of a dispute.
 */
import type { LedgerKind } from '../statuses';

/** What a step of a booking's payment records (words in PAYMENT_STEP_LABELS). */
export type PaymentStep =
	'checkout-opened' | 'paid' | 'refunded-after-lapse' | 'release-requested' | 'released';

/** A ledger account, as `ledger_entry.account` stores it. */
export type LedgerAccountName =
	'platform_cash' | 'owner_funds_held' | 'installer_payable' | 'fee_revenue' | 'gst_payable';

/** One line of a booking's timeline. `key` is unique within one timeline. */
export type TimelineEntry =
	| { kind: 'booking'; key: string; at: Date; step: 'booked' | 'hold-ends' }
	| { kind: 'payment'; key: string; at: Date; step: PaymentStep; amountCents: number | null }
	| { kind: 'provider-event'; key: string; at: Date; type: string }
	| {
			kind: 'ledger';
			key: string;
			at: Date;
			transactionKind: LedgerKind;
			memo: string;
			entries: { account: LedgerAccountName; amountCents: number }[];
	  }
	| {
			kind: 'work';
			key: string;
			at: Date;
			/** Words for the step, e.g. "Fit report filed (visit 1)". */
			title: string;
			detail: string | null;
	  }
	| {
			kind: 'message';
			key: string;
			at: Date;
			from: 'owner' | 'installer' | 'someone-else';
			authorName: string;
			body: string;
			masked: string[];
	  };

/**
 * At one instant, the order that reads as cause before effect: the booking, the provider's event,
 * the payment step it caused, then the ledger lines written with it (all in one transaction, so
 * they often share a timestamp), then the work, then messages. Money that a step of the work
 * moves (a release on acceptance, a refund or late fee on settlement or cancellation) is written
 * at that step's instant, so at one instant it reads after the work.
 */
const KIND_ORDER: Record<TimelineEntry['kind'] | 'moved-by-work', number> = {
	booking: 0,
	'provider-event': 1,
	payment: 2,
	ledger: 3,
	work: 4,
	'moved-by-work': 5,
	message: 6
};

function rank(e: TimelineEntry): number {
	if (e.kind === 'ledger' && e.transactionKind !== 'payment') return KIND_ORDER['moved-by-work'];
	return KIND_ORDER[e.kind];
}

/** Orders two entries by time, then kind (KIND_ORDER), then key: never a tie for distinct keys. */
export function compareTimelineEntries(a: TimelineEntry, b: TimelineEntry): number {
	return (
		a.at.getTime() - b.at.getTime() ||
		rank(a) - rank(b) ||
		(a.key < b.key ? -1 : a.key > b.key ? 1 : 0)
	);
}

/** Every entry of the given lists in one list, oldest first (see compareTimelineEntries). */
export function mergeTimeline(...sources: readonly (readonly TimelineEntry[])[]): TimelineEntry[] {
	return sources.flat().sort(compareTimelineEntries);
}

/** The booking's own entries: when it was made and when its hold on the slot ends (or ended). */
export function bookingEntries(booking: { createdAt: Date; holdExpiresAt: Date }): TimelineEntry[] {
	return [
		{ kind: 'booking', key: 'booked', at: booking.createdAt, step: 'booked' },
		{ kind: 'booking', key: 'hold-ends', at: booking.holdExpiresAt, step: 'hold-ends' }
	];
}

/** The steps of a booking's payment row that have happened, each at its own time. */
export function paymentEntries(payment: {
	createdAt: Date;
	paidAt: Date | null;
	refundedAfterLapseAt: Date | null;
	releaseRequestedAt: Date | null;
	releasedAt: Date | null;
	payoutCents: number | null;
}): TimelineEntry[] {
	const steps: [PaymentStep, Date | null, number | null][] = [
		['checkout-opened', payment.createdAt, null],
		['paid', payment.paidAt, null],
		['refunded-after-lapse', payment.refundedAfterLapseAt, null],
		['release-requested', payment.releaseRequestedAt, null],
		['released', payment.releasedAt, payment.payoutCents]
	];
	return steps.flatMap(([step, at, amountCents]) =>
		at ? [{ kind: 'payment' as const, key: step, at, step, amountCents }] : []
	);
}

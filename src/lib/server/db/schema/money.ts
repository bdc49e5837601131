import { index, integer, pgTable, text, timestamp, uniqueIndex, uuid } from 'drizzle-orm/pg-core';
import { createdAt } from './columns';
import { ledgerAccount, ledgerKind } from './enums';
import { booking } from './marketplace';

/**
 * Paying a booking into held funds: one row per booking, from the first checkout. The ledger,
 * not this row, says how much is held; this row keeps the provider's ids and what happened.
 */
export const payment = pgTable('payment', {
	bookingId: uuid('booking_id')
		.primaryKey()
		.references(() => booking.id),
	checkoutSessionId: text('checkout_session_id').unique(),
	checkoutUrl: text('checkout_url'),
	paymentIntentId: text('payment_intent_id').unique(),
	chargeId: text('charge_id').unique(),
	paidAt: timestamp('paid_at', { withTimezone: true }),
	/** Why the last attempt failed, in the provider's words for the owner; null after success. */
	lastProblem: text('last_problem'),
	/** Set when the money arrived after the hold lapsed and the slot was gone: refunded in full. */
	refundedAfterLapseAt: timestamp('refunded_after_lapse_at', { withTimezone: true }),
	/** Release was asked for (by completion or an admin); a failed call is retried by the schedule. */
	releaseRequestedAt: timestamp('release_requested_at', { withTimezone: true }),
	releasedAt: timestamp('released_at', { withTimezone: true }),
	transferId: text('transfer_id').unique(),
	feeCents: integer('fee_cents'),
	gstOnFeeCents: integer('gst_on_fee_cents'),
	payoutCents: integer('payout_cents'),
	lastReleaseError: text('last_release_error'),
	createdAt: createdAt()
});

/** Provider events already processed; the primary key makes each event id count once. */
export const paymentEvent = pgTable(
	'payment_event',
	{
		eventId: text('event_id').primaryKey(),
		type: text('type').notNull(),
		/** The booking the event is about (its object's metadata), when that booking exists. */
		bookingId: uuid('booking_id').references(() => booking.id),
		processedAt: createdAt()
	},
	(t) => [index('payment_event_booking_idx').on(t.bookingId, t.processedAt)]
);

/**
 * One movement of money: two or more entries that sum to zero (checked at commit by a deferred
 * trigger, the ledger-rules migration). Append-only: a mistake is put right by a 'reversal', never an update.
 */
export const ledgerTransaction = pgTable(
	'ledger_transaction',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		kind: ledgerKind('kind').notNull(),
		bookingId: uuid('booking_id').references(() => booking.id),
		/** The provider's object behind it (charge, transfer, refund); at most one per kind. */
		reference: text('reference').notNull(),
		reverses: uuid('reverses'),
		memo: text('memo').notNull(),
		createdAt: createdAt()
	},
	(t) => [
		uniqueIndex('ledger_transaction_kind_reference_idx').on(t.kind, t.reference),
		index('ledger_transaction_booking_idx').on(t.bookingId)
	]
);

export const ledgerEntry = pgTable(
	'ledger_entry',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		transactionId: uuid('transaction_id')
			.notNull()
			.references(() => ledgerTransaction.id),
		account: ledgerAccount('account').notNull(),
		bookingId: uuid('booking_id').references(() => booking.id),
		/** Integer cents; debit positive, credit negative. */
		amountCents: integer('amount_cents').notNull(),
		createdAt: createdAt()
	},
	(t) => [
		index('ledger_entry_transaction_idx').on(t.transactionId),
		index('ledger_entry_booking_account_idx').on(t.bookingId, t.account)
	]
);

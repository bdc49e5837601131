/**
 * The held-funds ledger: double entry in integer cents, debits positive and credits negative.
 * Every transaction is two or more entries summing to zero (checked here and, at commit, by a
 * deferred trigger); rows are never changed or deleted (triggers refuse it), only reversed. The
 * ledger, not the payment provider, says what a booking holds.
 */
import { and, eq, sql } from 'drizzle-orm';
import { db, type Tx } from '../db';
import { ledgerEntry, ledgerTransaction } from '../db/schema';

export type LedgerAccount = (typeof ledgerEntry.$inferInsert)['account'];
export type LedgerKind = (typeof ledgerTransaction.$inferInsert)['kind'];

export interface LedgerPosting {
	kind: LedgerKind;
	bookingId: string | null;
	/** The provider's object behind the movement; one transaction per kind and reference. */
	reference: string;
	memo: string;
	entries: { account: LedgerAccount; amountCents: number }[];
	reverses?: string;
	/** When it happened, on the caller's clock (its `now`); the database's time when absent. */
	at?: Date;
}

/**
 * Posts one balanced transaction in the caller's transaction. Posting the same kind and
 * reference again changes nothing and returns null (so a replayed event cannot count twice).
 * @returns the new transaction's id, or null when it was already posted
 */
export async function postLedgerTransaction(
	tx: Tx,
	posting: LedgerPosting
): Promise<string | null> {
	const sum = posting.entries.reduce((total, e) => total + e.amountCents, 0);
	if (posting.entries.length < 2 || sum !== 0) {
		throw new Error(
			`Unbalanced ledger posting ${posting.kind} ${posting.reference}: sums to ${sum}`
		);
	}
	for (const e of posting.entries) {
		if (!Number.isSafeInteger(e.amountCents))
			throw new RangeError('Ledger amounts are whole cents');
	}
	const [made] = await tx
		.insert(ledgerTransaction)
		.values({
			kind: posting.kind,
			bookingId: posting.bookingId,
			reference: posting.reference,
			memo: posting.memo,
			reverses: posting.reverses ?? null,
			...(posting.at ? { createdAt: posting.at } : {})
		})
		.onConflictDoNothing({ target: [ledgerTransaction.kind, ledgerTransaction.reference] })
		.returning({ id: ledgerTransaction.id });
	if (!made) return null;
	await tx.insert(ledgerEntry).values(
		posting.entries
			.filter((e) => e.amountCents !== 0)
			.map((e) => ({
				transactionId: made.id,
				account: e.account,
				bookingId: posting.bookingId,
				amountCents: e.amountCents
			}))
	);
	return made.id;
}

/**
 * Reverses a posted transaction with its entries negated (the only way to correct the ledger).
 * @returns the reversal's id, or null when it was reversed already
 */
export async function reverseLedgerTransaction(
	tx: Tx,
	transactionId: string,
	memo: string
): Promise<string | null> {
	const [original] = await tx
		.select()
		.from(ledgerTransaction)
		.where(eq(ledgerTransaction.id, transactionId));
	if (!original) throw new Error(`No ledger transaction ${transactionId}`);
	const entries = await tx
		.select({ account: ledgerEntry.account, amountCents: ledgerEntry.amountCents })
		.from(ledgerEntry)
		.where(eq(ledgerEntry.transactionId, transactionId));
	return postLedgerTransaction(tx, {
		kind: 'reversal',
		bookingId: original.bookingId,
		reference: `reversal:${transactionId}`,
		memo,
		reverses: transactionId,
		entries: entries.map((e) => ({ account: e.account, amountCents: -e.amountCents }))
	});
}

/** What a booking holds now: the credit balance of its owner_funds_held account, in cents. */
export async function heldCents(tx: Tx | typeof db, bookingId: string): Promise<number> {
	const [row] = await tx
		.select({ total: sql<string>`coalesce(sum(${ledgerEntry.amountCents}), 0)` })
		.from(ledgerEntry)
		.where(and(eq(ledgerEntry.bookingId, bookingId), eq(ledgerEntry.account, 'owner_funds_held')));
	const total = Number(row?.total ?? 0);
	return total === 0 ? 0 : -total;
}

/** The balance of one ledger account across all bookings (debit positive). */
export async function accountBalance(account: LedgerAccount): Promise<number> {
	const [row] = await db
		.select({ total: sql<string>`coalesce(sum(${ledgerEntry.amountCents}), 0)` })
		.from(ledgerEntry)
		.where(eq(ledgerEntry.account, account));
	return Number(row?.total ?? 0);
}

/** A booking's ledger, oldest first: each transaction with its entries. */
export async function listBookingLedger(bookingId: string) {
	const rows = await db
		.select({
			id: ledgerTransaction.id,
			kind: ledgerTransaction.kind,
			memo: ledgerTransaction.memo,
			reference: ledgerTransaction.reference,
			createdAt: ledgerTransaction.createdAt,
			account: ledgerEntry.account,
			amountCents: ledgerEntry.amountCents
		})
		.from(ledgerTransaction)
		.innerJoin(ledgerEntry, eq(ledgerEntry.transactionId, ledgerTransaction.id))
		.where(eq(ledgerTransaction.bookingId, bookingId))
		.orderBy(ledgerTransaction.createdAt, ledgerTransaction.id);
	return rows;
}

/**
 * Everything wrong with the ledger: transactions that do not sum to zero or have fewer than two
 * entries, and bookings whose held balance is negative. Empty when the ledger is sound.
 */
export async function findLedgerProblems(): Promise<string[]> {
	const unbalanced = await db.execute<{ id: string; total: string; entries: string }>(sql`
		select t.id, coalesce(sum(e.amount_cents), 0) as total, count(e.id) as entries
		from ledger_transaction t left join ledger_entry e on e.transaction_id = t.id
		group by t.id
		having coalesce(sum(e.amount_cents), 0) <> 0 or count(e.id) < 2`);
	const negative = await db.execute<{ booking_id: string; held: string }>(sql`
		select booking_id, -sum(amount_cents) as held from ledger_entry
		where account = 'owner_funds_held' and booking_id is not null
		group by booking_id having -sum(amount_cents) < 0`);
	return [
		...unbalanced.rows.map(
			(r) => `transaction ${r.id}: ${r.entries} entries summing to ${r.total} cents`
		),
		...negative.rows.map((r) => `booking ${r.booking_id} holds ${r.held} cents`)
	];
}

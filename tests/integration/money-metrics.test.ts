// The money figures of the admin overview, from the ledger, on a hand-computed fixture. Each test
// file has its own database, so the ledger here holds only what this file posts.
import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { ledgerEntry, ledgerTransaction } from '$lib/server/db/schema';
import { getMoneyMetrics } from '$lib/server/money/money-metrics';
import type { LedgerAccount, LedgerKind } from '$lib/server/money/ledger';

// Wednesday 25 Nov 2026, 12:30 pm in Adelaide (ACDT, UTC+10:30; IANA tz rule AS). Two whole weeks
// open on Monday 16 Nov at midnight Adelaide time, 2026-11-15T13:30Z.
const NOW = new Date('2026-11-25T02:00:00Z');

/** Posts one balanced transaction at a given moment (the ledger refuses updates, not inserts). */
async function post(
	at: string,
	kind: LedgerKind,
	entries: [LedgerAccount, number][],
	reverses: string | null = null
) {
	return db.transaction(async (tx) => {
		const [t] = await tx
			.insert(ledgerTransaction)
			.values({
				kind,
				bookingId: null,
				reference: `fixture-${crypto.randomUUID()}`,
				memo: 'fixture',
				reverses,
				createdAt: new Date(at)
			})
			.returning({ id: ledgerTransaction.id });
		await tx.insert(ledgerEntry).values(
			entries.map(([account, amountCents]) => ({
				transactionId: t!.id,
				account,
				bookingId: null,
				amountCents
			}))
		);
		return t!.id;
	});
}

/** A release of `held` with a fee of `fee` incl. GST (GST = fee / 11), as releaseHeldFunds posts. */
function releaseEntries(held: number, fee: number): [LedgerAccount, number][] {
	const gst = Math.round(fee / 11);
	const payout = held - fee;
	return [
		['owner_funds_held', held],
		['fee_revenue', -(fee - gst)],
		['gst_payable', -gst],
		['installer_payable', -payout],
		['installer_payable', payout],
		['platform_cash', -payout]
	];
}

describe('the money metrics of the admin overview', () => {
	it('sum fees, GST, payouts and refunds in the window, reversals netted', async () => {
		// Before the window (Sun 15 Nov 23:00 Adelaide = 12:30Z): not counted.
		await post('2026-11-15T12:30:00Z', 'release', releaseEntries(50_000, 5_500));
		// In the window: two releases, one later reversed.
		await post('2026-11-16T01:00:00Z', 'release', releaseEntries(44_000, 4_400));
		const reversed = await post('2026-11-18T01:00:00Z', 'release', releaseEntries(33_000, 3_300));
		await post(
			'2026-11-19T01:00:00Z',
			'reversal',
			releaseEntries(33_000, 3_300).map(([a, n]) => [a, -n]),
			reversed
		);
		// Two refunds: $120.00 and $30.50.
		for (const cents of [12_000, 3_050]) {
			await post('2026-11-20T01:00:00Z', 'refund', [
				['owner_funds_held', cents],
				['platform_cash', -cents]
			]);
		}
		// After `now`: not counted.
		await post('2026-11-25T03:00:00Z', 'release', releaseEntries(10_000, 1_500));

		const m = await getMoneyMetrics(NOW, 2);
		// Hand-computed: only the $440.00 release stands. Fee $44.00 incl. GST: GST = 4400/11 =
		// $4.00 (GST Act 1999 s 9-70: one eleventh of a taxable supply's price), fee ex GST $40.00;
		// paid out 44,000 - 4,400 = $396.00.
		expect(m).toEqual({
			feeRevenueCents: 4_000,
			gstOnFeesCents: 400,
			paidOutCents: 39_600,
			refunds: 2,
			refundedCents: 15_050
		});
	});

	it('are zero on an empty window', async () => {
		expect(await getMoneyMetrics(new Date('2020-01-01T00:00:00Z'), 1)).toEqual({
			feeRevenueCents: 0,
			gstOnFeesCents: 0,
			paidOutCents: 0,
			refunds: 0,
			refundedCents: 0
		});
	});
});

/**
 * The money side of the admin overview, from the ledger (not the provider): Tapline's fee revenue
 * and the GST on it, what was paid out to installers, and refunds to owners, over the same window
 * of whole Adelaide weeks as the marketplace metrics. Reversals count against what they reverse,
 * because each figure is a sum of ledger entries on one account.
 * tests/integration/money-metrics.test.ts checks each against a hand-computed fixture.
 */
import { sql } from 'drizzle-orm';
import { db } from '../db';

export interface MoneyMetrics {
	/** Tapline's fee revenue, GST excluded (credits to fee_revenue), cents. */
	feeRevenueCents: number;
	/** GST on those fees, owed to the ATO (credits to gst_payable), cents. */
	gstOnFeesCents: number;
	/** Released to installers (cash out by releases, less reversed ones), cents. */
	paidOutCents: number;
	refunds: number;
	/** Refunded to owners from held funds, cents. */
	refundedCents: number;
}

/**
 * The money figures over the last `weeks` whole weeks to `now` (the current week included), weeks
 * starting Monday in `zone`, as getMarketMetrics counts them.
 */
export async function getMoneyMetrics(
	now = new Date(),
	weeks = 12,
	zone = 'Australia/Adelaide'
): Promise<MoneyMetrics> {
	const weekStart = sql`(date_trunc('week', ${now}::timestamptz AT TIME ZONE ${zone}) - make_interval(weeks => ${weeks - 1}))`;
	const from = sql`(${weekStart} AT TIME ZONE ${zone})`;
	const [row] = (
		await db.execute<{
			fee: string | null;
			gst: string | null;
			paid_out: string | null;
			refunds: number;
			refunded: string | null;
		}>(sql`
		SELECT
			-sum(e.amount_cents) FILTER (WHERE e.account = 'fee_revenue') AS fee,
			-sum(e.amount_cents) FILTER (WHERE e.account = 'gst_payable') AS gst,
			-sum(e.amount_cents) FILTER (WHERE e.account = 'platform_cash'
				AND (t.kind = 'release' OR (t.kind = 'reversal' AND r.kind = 'release'))) AS paid_out,
			count(DISTINCT t.id) FILTER (WHERE t.kind = 'refund')::int AS refunds,
			sum(e.amount_cents) FILTER (WHERE e.account = 'owner_funds_held'
				AND (t.kind = 'refund' OR (t.kind = 'reversal' AND r.kind = 'refund'))) AS refunded
		FROM ledger_transaction t
		JOIN ledger_entry e ON e.transaction_id = t.id
		LEFT JOIN ledger_transaction r ON r.id = t.reverses
		WHERE t.created_at >= ${from} AND t.created_at <= ${now}`)
	).rows;
	return {
		feeRevenueCents: Number(row?.fee ?? 0),
		gstOnFeesCents: Number(row?.gst ?? 0),
		paidOutCents: Number(row?.paid_out ?? 0),
		refunds: row?.refunds ?? 0,
		refundedCents: Number(row?.refunded ?? 0)
	};
}

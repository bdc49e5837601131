/**
 * Payouts for admins: every release of held funds to an installer, filtered by the Adelaide
 * calendar day it was released on, newest first. The page shows 25 at a time; the CSV export
 * writes the same rows for the whole range (csv-stringify), as the booking list does.
 */
import {
	and,
	count,
	desc,
	eq,
	gte,
	isNotNull,
	lt,
	sql,
	type AnyColumn,
	type SQL
} from 'drizzle-orm';
import { stringify } from 'csv-stringify/sync';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { formatInZone, localToUtc } from '$lib/time';
import { db } from '../db';
import { booking, installerProfile, job, payment } from '../db/schema';
import { csvText, MAX_EXPORT_ROWS } from '../marketplace/admin-bookings';

export const PAYOUTS_PAGE_SIZE = 25;
const ZONE = 'Australia/Adelaide';

/** The range of release days, 'YYYY-MM-DD' at both ends (included), '' for open. */
export interface PayoutQuery {
	from: string;
	to: string;
}

/** The first instant of the day after `day` in Adelaide. */
function dayAfter(day: string): Date {
	const next = new Date(`${day}T00:00:00Z`);
	next.setUTCDate(next.getUTCDate() + 1);
	return localToUtc(next.toISOString().slice(0, 10), '00:00', ZONE);
}

function filterOf(query: PayoutQuery): SQL {
	const where: SQL[] = [isNotNull(payment.releasedAt)];
	if (query.from) where.push(gte(payment.releasedAt, localToUtc(query.from, '00:00', ZONE)));
	if (query.to) where.push(lt(payment.releasedAt, dayAfter(query.to)));
	return and(...where)!;
}

/** One page of payouts, newest first. */
export function listPayoutsForAdmin(query: PayoutQuery, page: { limit: number; offset: number }) {
	return db
		.select({
			bookingId: booking.id,
			releasedAt: payment.releasedAt,
			title: job.title,
			installerId: booking.installerId,
			businessName: installerProfile.businessName,
			totalCents: booking.totalCents,
			payoutCents: payment.payoutCents,
			feeCents: payment.feeCents,
			gstOnFeeCents: payment.gstOnFeeCents,
			transferId: payment.transferId
		})
		.from(payment)
		.innerJoin(booking, eq(booking.id, payment.bookingId))
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
		.where(filterOf(query))
		.orderBy(desc(payment.releasedAt), desc(booking.id))
		.limit(page.limit)
		.offset(page.offset);
}

/** How many payouts, and their sums, the query finds. */
export async function summarisePayouts(query: PayoutQuery) {
	const [row] = await db
		.select({
			count: count(),
			payoutCents: sqlSum(payment.payoutCents),
			feeCents: sqlSum(payment.feeCents)
		})
		.from(payment)
		.where(filterOf(query));
	return row ?? { count: 0, payoutCents: 0, feeCents: 0 };
}

function sqlSum(column: AnyColumn) {
	return sql<number>`coalesce(sum(${column}), 0)`.mapWith(Number);
}

export const PAYOUT_CSV_COLUMNS = [
	'Booking',
	'Released (Adelaide time)',
	'Job',
	'Installer',
	'Booking total (AUD, incl. GST)',
	"Tapline's fee (AUD, incl. GST)",
	'GST on the fee (AUD)',
	'Paid to the installer (AUD)',
	'Transfer'
] as const;

type PayoutRow = Awaited<ReturnType<typeof listPayoutsForAdmin>>[number];
const dollars = (cents: number | null) => ((cents ?? 0) / 100).toFixed(2);

/** One payout as a CSV record: dollars with two decimals, local times. */
export function payoutCsvRecord(row: PayoutRow): string[] {
	return [
		row.bookingId,
		row.releasedAt ? formatInZone(row.releasedAt, ZONE, 'yyyy-MM-dd HH:mm') : '',
		csvText(titleOrUntitled(row.title)),
		csvText(row.businessName),
		dollars(row.totalCents),
		dollars(row.feeCents),
		dollars(row.gstOnFeeCents),
		dollars(row.payoutCents),
		row.transferId ?? ''
	];
}

/** The payouts the query finds as CSV with a header row, or null when there are too many. */
export async function exportPayoutsCsv(query: PayoutQuery): Promise<string | null> {
	const rows = await listPayoutsForAdmin(query, { limit: MAX_EXPORT_ROWS + 1, offset: 0 });
	if (rows.length > MAX_EXPORT_ROWS) return null;
	return stringify([[...PAYOUT_CSV_COLUMNS], ...rows.map(payoutCsvRecord)], {
		record_delimiter: 'windows'
	});
}

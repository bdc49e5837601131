/**
 * Every booking for admins: one query, filtered by the day it was made (Adelaide calendar days),
 * status and words in the job, owner or installer, sorted newest first. The page shows it 25 at a
 * time; the CSV export writes the same rows for the whole range (csv-stringify), so the file and
 * the table never disagree.
 */
import { and, desc, eq, gte, ilike, lt, or, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { stringify } from 'csv-stringify/sync';
import { BOOKING_STATUS_LABELS } from '$lib/labels';
import { titleOrUntitled } from '$lib/posted-job';
import { formatInZone, localToUtc } from '$lib/time';
import { db } from './db';
import { booking, installerProfile, job, quote, user, type Booking } from './db/schema';

/** Bookings on one page of the admin's table. */
export const BOOKINGS_PAGE_SIZE = 25;
/** The most rows one CSV export writes; a wider range is refused with a message. */
export const MAX_EXPORT_ROWS = 50_000;
/** The zone whose calendar days the date range means. */
const ZONE = 'Australia/Adelaide';

/** What the admin's booking list filters on; dates are 'YYYY-MM-DD', both ends included. */
export interface BookingQuery {
	from: string;
	to: string;
	status: Booking['status'] | '';
	q: string;
}

const likeEscape = (text: string) => text.replace(/[\\%_]/g, (c) => `\\${c}`);

const owner = alias(user, 'owner');

function filterOf(query: BookingQuery): SQL | undefined {
	const where: SQL[] = [];
	if (query.from) where.push(gte(booking.createdAt, localToUtc(query.from, '00:00', ZONE)));
	if (query.to) {
		// Up to the end of the last day: before midnight at the start of the next one.
		const next = new Date(`${query.to}T00:00:00Z`);
		next.setUTCDate(next.getUTCDate() + 1);
		where.push(lt(booking.createdAt, localToUtc(next.toISOString().slice(0, 10), '00:00', ZONE)));
	}
	if (query.status) where.push(eq(booking.status, query.status));
	const q = query.q.trim();
	if (q) {
		const pattern = `%${likeEscape(q)}%`;
		where.push(
			or(
				ilike(job.title, pattern),
				ilike(owner.displayName, pattern),
				ilike(installerProfile.businessName, pattern)
			)!
		);
	}
	return where.length ? and(...where) : undefined;
}

/** The rows of the admin's booking list, newest first. */
export function listBookingsForAdmin(query: BookingQuery, page: { limit: number; offset: number }) {
	return db
		.select({
			id: booking.id,
			createdAt: booking.createdAt,
			jobId: job.id,
			title: job.title,
			ownerName: owner.displayName,
			ownerId: owner.id,
			installerId: booking.installerId,
			businessName: installerProfile.businessName,
			slotStart: booking.slotStart,
			status: booking.status,
			totalCents: booking.totalCents,
			gstCents: quote.gstCents,
			gstRegistered: quote.gstRegistered
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(owner, eq(owner.id, booking.ownerId))
		.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
		.innerJoin(quote, eq(quote.id, booking.quoteId))
		.where(filterOf(query))
		.orderBy(desc(booking.createdAt), desc(booking.id))
		.limit(page.limit)
		.offset(page.offset);
}

/** How many bookings the query finds. */
export async function countBookingsForAdmin(query: BookingQuery): Promise<number> {
	return db.$count(
		db
			.select({ id: booking.id })
			.from(booking)
			.innerJoin(job, eq(job.id, booking.jobId))
			.innerJoin(owner, eq(owner.id, booking.ownerId))
			.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
			.where(filterOf(query))
			.as('found')
	);
}

/** The CSV columns, in order, as a spreadsheet's header row shows them. */
export const BOOKING_CSV_COLUMNS = [
	'Booking',
	'Booked (Adelaide time)',
	'Job',
	'Owner',
	'Installer',
	'Fit starts (Adelaide time)',
	'Status',
	'Total (AUD, incl. GST)',
	'GST (AUD)'
] as const;

type BookingRow = Awaited<ReturnType<typeof listBookingsForAdmin>>[number];

/**
 * A text cell a spreadsheet will not run: one starting with =, +, -, @, tab or carriage return
 * gets a leading apostrophe (OWASP, "CSV Injection").
 */
export const csvText = (value: string) => (/^[=+\-@\t\r]/.test(value) ? `'${value}` : value);

/** One booking as a CSV record: plain figures (dollars with two decimals), ISO-like local times. */
export function bookingCsvRecord(row: BookingRow): string[] {
	return [
		row.id,
		formatInZone(row.createdAt, ZONE, 'yyyy-MM-dd HH:mm'),
		csvText(titleOrUntitled(row.title)),
		csvText(row.ownerName),
		csvText(row.businessName),
		formatInZone(row.slotStart, ZONE, 'yyyy-MM-dd HH:mm'),
		BOOKING_STATUS_LABELS[row.status],
		(row.totalCents / 100).toFixed(2),
		row.gstRegistered ? (row.gstCents / 100).toFixed(2) : '0.00'
	];
}

/**
 * The bookings the query finds as CSV (RFC 4180, with a header row), or null when there are
 * more than {@link MAX_EXPORT_ROWS} (narrow the range).
 */
export async function exportBookingsCsv(query: BookingQuery): Promise<string | null> {
	const rows = await listBookingsForAdmin(query, { limit: MAX_EXPORT_ROWS + 1, offset: 0 });
	if (rows.length > MAX_EXPORT_ROWS) return null;
	return stringify([[...BOOKING_CSV_COLUMNS], ...rows.map(bookingCsvRecord)], {
		record_delimiter: 'windows'
	});
}

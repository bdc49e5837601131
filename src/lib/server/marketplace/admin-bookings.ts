/**
 * Every booking for admins: one query, filtered by the day it was made (Adelaide calendar days),
 * status and words in the job, owner or installer, sorted newest first. The page shows it 25 at a
 * time; the CSV export writes the same rows for the whole range (csv-stringify), so the file and
 * the table never disagree.
 */
import { and, asc, desc, eq, gte, ilike, inArray, lt, or, type SQL } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import { stringify } from 'csv-stringify/sync';
import { BOOKING_STATUS_LABELS, DISPUTE_EVENT_LABELS } from '$lib/labels';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { formatInZone, localToUtc } from '$lib/time';
import {
	bookingEntries,
	mergeTimeline,
	paymentEntries,
	type TimelineEntry
} from '$lib/work/timeline';
import { db } from '../db';
import {
	booking,
	dispute,
	disputeEvent,
	fitReport,
	installerProfile,
	job,
	jobMessage,
	ledgerEntry,
	ledgerTransaction,
	payment,
	paymentEvent,
	quote,
	user,
	type Booking
} from '../db/schema';

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

/** One booking for the admin's booking page: its header and its timeline, oldest first. */
export interface BookingTimeline {
	booking: {
		id: string;
		jobId: string;
		title: string | null;
		ownerId: string;
		ownerName: string;
		installerId: string;
		businessName: string;
		slotStart: Date;
		slotEnd: Date;
		status: Booking['status'];
		totalCents: number;
		/** Why the last payment attempt failed, if it did (the payment row keeps no time for it). */
		lastPaymentProblem: string | null;
		/** Why the last release attempt failed, if it did (no time kept either). */
		lastReleaseError: string | null;
	};
	entries: TimelineEntry[];
}

/**
 * A booking and everything the database holds about it in time order: the booking made and its
 * hold, each step of its payment, each provider event recorded for it, each ledger transaction with its entries, and the job's
 * messages between that owner and installer (as stored: masked at writing when they had to be).
 * Null when there is no such booking.
 */
export async function getBookingTimeline(bookingId: string): Promise<BookingTimeline | null> {
	const [head] = await db
		.select({
			id: booking.id,
			jobId: booking.jobId,
			title: job.title,
			ownerId: booking.ownerId,
			ownerName: owner.displayName,
			installerId: booking.installerId,
			businessName: installerProfile.businessName,
			slotStart: booking.slotStart,
			slotEnd: booking.slotEnd,
			status: booking.status,
			totalCents: booking.totalCents,
			createdAt: booking.createdAt,
			holdExpiresAt: booking.holdExpiresAt
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(owner, eq(owner.id, booking.ownerId))
		.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
		.where(eq(booking.id, bookingId));
	if (!head) return null;

	const [payments, events, transactions, messages] = await Promise.all([
		db
			.select({
				createdAt: payment.createdAt,
				paidAt: payment.paidAt,
				refundedAfterLapseAt: payment.refundedAfterLapseAt,
				releaseRequestedAt: payment.releaseRequestedAt,
				releasedAt: payment.releasedAt,
				payoutCents: payment.payoutCents,
				lastProblem: payment.lastProblem,
				lastReleaseError: payment.lastReleaseError
			})
			.from(payment)
			.where(eq(payment.bookingId, bookingId)),
		db
			.select({
				eventId: paymentEvent.eventId,
				type: paymentEvent.type,
				processedAt: paymentEvent.processedAt
			})
			.from(paymentEvent)
			.where(eq(paymentEvent.bookingId, bookingId)),
		db
			.select({
				id: ledgerTransaction.id,
				kind: ledgerTransaction.kind,
				memo: ledgerTransaction.memo,
				createdAt: ledgerTransaction.createdAt
			})
			.from(ledgerTransaction)
			.where(eq(ledgerTransaction.bookingId, bookingId)),
		db
			.select({
				id: jobMessage.id,
				authorId: jobMessage.authorId,
				authorName: user.displayName,
				body: jobMessage.body,
				masked: jobMessage.masked,
				createdAt: jobMessage.createdAt
			})
			.from(jobMessage)
			.innerJoin(user, eq(user.id, jobMessage.authorId))
			.where(and(eq(jobMessage.jobId, head.jobId), eq(jobMessage.installerId, head.installerId)))
	]);
	const entries = transactions.length
		? await db
				.select({
					transactionId: ledgerEntry.transactionId,
					account: ledgerEntry.account,
					amountCents: ledgerEntry.amountCents
				})
				.from(ledgerEntry)
				.where(
					inArray(
						ledgerEntry.transactionId,
						transactions.map((t) => t.id)
					)
				)
				// Debits first, then credits; the id keeps equal lines in one order.
				.orderBy(desc(ledgerEntry.amountCents), asc(ledgerEntry.id))
		: [];

	const work = await workEntries(bookingId);
	const paid = payments[0];
	const { createdAt, holdExpiresAt, ...header } = head;
	return {
		booking: {
			...header,
			lastPaymentProblem: paid?.lastProblem ?? null,
			lastReleaseError: paid?.lastReleaseError ?? null
		},
		entries: mergeTimeline(
			bookingEntries({ createdAt, holdExpiresAt }),
			paid ? paymentEntries(paid) : [],
			work,
			events.map((e) => ({
				kind: 'provider-event' as const,
				key: `event:${e.eventId}`,
				at: e.processedAt,
				type: e.type
			})),
			transactions.map((t) => ({
				kind: 'ledger' as const,
				key: `ledger:${t.id}`,
				at: t.createdAt,
				transactionKind: t.kind,
				memo: t.memo,
				entries: entries
					.filter((e) => e.transactionId === t.id)
					.map(({ account, amountCents }) => ({ account, amountCents }))
			})),
			messages.map((m) => ({
				kind: 'message' as const,
				key: `message:${m.id}`,
				at: m.createdAt,
				from:
					m.authorId === head.ownerId
						? ('owner' as const)
						: m.authorId === head.installerId
							? ('installer' as const)
							: ('someone-else' as const),
				authorName: m.authorName,
				body: m.body,
				masked: m.masked
			}))
		)
	};
}

const ACCEPTED_WORDS: Record<string, string> = {
	owner: 'Work confirmed by the owner',
	window: 'Work confirmed: the confirmation window closed',
	settlement: 'Work settled by Tapline'
};

/**
 * The work's own steps on a booking's timeline: each fit report, the acceptance of the work and
 * each step of its disputes (words in DISPUTE_EVENT_LABELS).
 */
async function workEntries(bookingId: string): Promise<TimelineEntry[]> {
	const [reports, accepted, steps] = await Promise.all([
		db
			.select({ id: fitReport.id, visit: fitReport.visit, filedAt: fitReport.filedAt })
			.from(fitReport)
			.where(eq(fitReport.bookingId, bookingId)),
		db
			.select({ at: booking.acceptedAt, by: booking.acceptedBy })
			.from(booking)
			.where(eq(booking.id, bookingId)),
		db
			.select({
				id: disputeEvent.id,
				kind: disputeEvent.kind,
				body: disputeEvent.body,
				at: disputeEvent.createdAt
			})
			.from(disputeEvent)
			.innerJoin(dispute, eq(dispute.id, disputeEvent.disputeId))
			.where(eq(dispute.bookingId, bookingId))
	]);
	const entries: TimelineEntry[] = reports.map((r) => ({
		kind: 'work',
		key: `fit-report:${r.id}`,
		at: r.filedAt,
		title: `Fit report filed (visit ${String(r.visit)})`,
		detail: null
	}));
	const done = accepted[0];
	if (done?.at) {
		entries.push({
			kind: 'work',
			key: 'accepted',
			at: done.at,
			title: ACCEPTED_WORDS[done.by ?? ''] ?? 'Work confirmed',
			detail: null
		});
	}
	for (const step of steps) {
		entries.push({
			kind: 'work',
			key: `dispute:${step.id}`,
			at: step.at,
			title: `Dispute: ${DISPUTE_EVENT_LABELS[step.kind]}`,
			detail: step.body
		});
	}
	return entries;
}

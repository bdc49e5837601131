/**
 * An installer's day: booked fits from today on, quotes waiting for the owner's answer, new jobs
 * offered and recent message threads. Every list is filtered to the installer and limited in SQL
 * (on booking_installer_idx, quote_installer_idx and job_message_installer_idx), read one page at a
 * time, so a busy installer's history never loads whole.
 */
import { and, asc, desc, eq, gt, inArray, isNull, or, sql } from 'drizzle-orm';
import { localToUtc } from '$lib/time';
import { localDate } from '$lib/people/vetting';
import { db } from '../db';
import { booking, installerProfile, job, jobMessage, quote } from '../db/schema';
import { getInstallerContext, listNewOfferedJobs } from '../marketplace/matching';
import { titleOrUntitled } from '$lib/marketplace/posted-job';

/** How many rows each section of the day view shows before its "see all" link. */
export const DAY_SECTION_LIMIT = 5;
/** Rows per page on the "see all" pages. */
export const DAY_PAGE_SIZE = 20;

/** A page of a list: `limit` rows from `offset`, and whether more follow. */
export interface PageRequest {
	limit: number;
	offset?: number;
}
export interface Page<T> {
	rows: T[];
	more: boolean;
}

/** One more row than asked says whether there is a next page, without counting every row. */
function pageOf<T>(rows: T[], limit: number): Page<T> {
	return { rows: rows.slice(0, limit), more: rows.length > limit };
}

/** The installer's zone (the Adelaide default before they have a profile). */
async function installerZone(installerId: string) {
	const [row] = await db
		.select({ timeZone: installerProfile.timeZone })
		.from(installerProfile)
		.where(eq(installerProfile.userId, installerId));
	return row?.timeZone ?? 'Australia/Adelaide';
}

/**
 * The installer's booked fits that end after the start of today in their zone, soonest first:
 * confirmed bookings and provisional ones whose hold has not run out at `now` (a run-out hold
 * reads as lapsed, as everywhere else; the schedule writes it).
 */
export async function listUpcomingFits(
	installerId: string,
	{ limit, offset = 0 }: PageRequest,
	now = new Date()
) {
	const zone = await installerZone(installerId);
	const startOfToday = localToUtc(localDate(now, zone), '00:00', zone);
	const rows = await db
		.select({
			bookingId: booking.id,
			jobId: booking.jobId,
			title: job.title,
			suburb: job.suburb,
			slotStart: booking.slotStart,
			slotEnd: booking.slotEnd,
			status: booking.status,
			stage: booking.stage
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.where(
			and(
				eq(booking.installerId, installerId),
				gt(booking.slotEnd, startOfToday),
				or(
					eq(booking.status, 'confirmed'),
					and(eq(booking.status, 'awaiting_payment'), gt(booking.holdExpiresAt, now))
				)
			)
		)
		.orderBy(asc(booking.slotStart), asc(booking.id))
		.limit(limit + 1)
		.offset(offset);
	const page = pageOf(
		rows.map((r) => ({ ...r, title: titleOrUntitled(r.title) })),
		limit
	);
	return { ...page, timeZone: zone };
}

/**
 * The installer's open quotes on jobs still collecting quotes and not expired at `now`: the owner
 * has yet to answer them. Most recently sent first.
 */
export async function listQuotesAwaitingAnswer(
	installerId: string,
	{ limit, offset = 0 }: PageRequest,
	now = new Date()
) {
	const rows = await db
		.select({
			quoteId: quote.id,
			jobId: quote.jobId,
			title: job.title,
			suburb: job.suburb,
			totalCents: quote.totalCents,
			revision: quote.revision,
			sentAt: quote.updatedAt,
			expiresAt: quote.expiresAt
		})
		.from(quote)
		.innerJoin(job, eq(job.id, quote.jobId))
		.where(
			and(
				eq(quote.installerId, installerId),
				eq(quote.status, 'live'),
				eq(job.status, 'collecting_quotes'),
				or(isNull(quote.expiresAt), gt(quote.expiresAt, now))
			)
		)
		.orderBy(desc(quote.updatedAt), asc(quote.id))
		.limit(limit + 1)
		.offset(offset);
	return pageOf(
		rows.map((r) => ({ ...r, title: titleOrUntitled(r.title) })),
		limit
	);
}

/**
 * The installer's message threads (one per job), the most recently active first, each with its
 * newest message and whether the owner wrote last (so the installer owes an answer). Messages are
 * stored masked, so nothing here reveals more than the thread itself.
 */
export async function listRecentThreads(installerId: string, { limit, offset = 0 }: PageRequest) {
	const lastAt = sql<Date>`max(${jobMessage.createdAt})`.mapWith(jobMessage.createdAt);
	const threads = await db
		.select({ jobId: jobMessage.jobId, lastAt })
		.from(jobMessage)
		.where(eq(jobMessage.installerId, installerId))
		.groupBy(jobMessage.jobId)
		.orderBy(desc(lastAt), asc(jobMessage.jobId))
		.limit(limit + 1)
		.offset(offset);
	const page = pageOf(threads, limit);
	if (page.rows.length === 0) return { rows: [], more: false };
	const ids = page.rows.map((t) => t.jobId);
	const latest = await db
		.selectDistinctOn([jobMessage.jobId], {
			jobId: jobMessage.jobId,
			authorId: jobMessage.authorId,
			body: jobMessage.body,
			createdAt: jobMessage.createdAt,
			title: job.title
		})
		.from(jobMessage)
		.innerJoin(job, eq(job.id, jobMessage.jobId))
		.where(and(eq(jobMessage.installerId, installerId), inArray(jobMessage.jobId, ids)))
		.orderBy(jobMessage.jobId, desc(jobMessage.createdAt), desc(jobMessage.id));
	const rows = page.rows.flatMap((t) => {
		const m = latest.find((l) => l.jobId === t.jobId);
		if (!m) return [];
		return [
			{
				jobId: t.jobId,
				title: titleOrUntitled(m.title),
				lastAt: m.createdAt,
				lastBody: m.body,
				ownerWroteLast: m.authorId !== installerId
			}
		];
	});
	return { rows, more: page.more };
}

/**
 * Open jobs offered to the installer in the last week that they have not quoted, newest first
 * (none while they cannot quote): the first `limit` and how many there are.
 */
export async function listNewJobsForDay(installerId: string, limit: number, now = new Date()) {
	const context = await getInstallerContext(installerId);
	if (!context?.canQuote) return { rows: [], total: 0, canQuote: false };
	const { jobs, total } = await listNewOfferedJobs(context, { days: 7, limit, now, counted: true });
	return {
		rows: jobs.map((j) => ({
			id: j.id,
			title: j.title,
			suburb: j.suburb,
			distanceKm: j.distanceKm,
			postedAt: j.postedAt
		})),
		total: total ?? jobs.length,
		canQuote: true
	};
}

/** Everything the day view shows, each section capped at {@link DAY_SECTION_LIMIT}. */
export async function getInstallerDay(installerId: string, now = new Date()) {
	const page = { limit: DAY_SECTION_LIMIT };
	const [fits, quotes, threads, newJobs] = await Promise.all([
		listUpcomingFits(installerId, page, now),
		listQuotesAwaitingAnswer(installerId, page, now),
		listRecentThreads(installerId, page),
		listNewJobsForDay(installerId, DAY_SECTION_LIMIT, now)
	]);
	return { fits, quotes, threads, newJobs };
}

/**
 * Reviews of an accepted booking, both ways (rules in $lib/work/reviews): writing one (once per side,
 * within the window, under the booking's row lock so two reviews arriving together both see each
 * other), the installer's one public reply, what each side sees on the booking, an installer's
 * public reviews, and the ratings the quote ranking uses. Only reviews that show count anywhere.
 */
import { and, count, desc, eq, inArray, isNull, lte, sql } from 'drizzle-orm';
import { REVIEW_ASPECT_LABELS } from '$lib/labels';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import {
	aspectsOf,
	mayReply,
	OWNER_ASPECTS,
	otherSide,
	overallStars,
	REVIEW_REPLY_MAX,
	REVIEW_TEXT_MAX,
	REVIEW_TEXT_MIN,
	REVIEW_WINDOW_DAYS,
	reviewVisibleFrom,
	reviewWindow,
	theirReviewState,
	type AspectStars,
	type ReviewSide
} from '$lib/work/reviews';
import { formatDay, formatDayTime } from '$lib/time';
import { db, type Db, type Tx } from '../db';
import { booking, installerProfile, job, review, user, type Review } from '../db/schema';
import { appUrl } from '../mail/app-url';
import { withMail } from '../mail/outbox';
import { refuse, type Refusal } from '../refusal';

const NOT_YOURS = 'There is no such booking among yours.';

/** Where each side writes and reads the reviews of a booking. */
export const reviewPath = (side: ReviewSide, bookingId: string) =>
	side === 'owner'
		? `/owner/bookings/${bookingId}/review`
		: `/installer/bookings/${bookingId}/review`;

/** The booking with both people, locked for update when `lock` (null when there is none). */
async function readBooking(tx: Tx | Db, bookingId: string, lock: boolean) {
	const query = tx
		.select({
			id: booking.id,
			jobId: booking.jobId,
			ownerId: booking.ownerId,
			installerId: booking.installerId,
			status: booking.status,
			stage: booking.stage,
			acceptedAt: booking.acceptedAt,
			title: job.title,
			timeZone: job.timeZone,
			ownerName: user.displayName,
			ownerEmail: user.email,
			businessName: installerProfile.businessName
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(user, eq(user.id, booking.ownerId))
		.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
		.where(eq(booking.id, bookingId));
	const [row] = lock ? await query.for('update', { of: booking }) : await query;
	return row ?? null;
}
type BookingRow = NonNullable<Awaited<ReturnType<typeof readBooking>>>;

const isParty = (row: BookingRow, side: ReviewSide, userId: string) =>
	(side === 'owner' ? row.ownerId : row.installerId) === userId;

/** The booking's review window at `now`, for a paid booking only. */
const windowOf = (row: BookingRow, now: Date) =>
	reviewWindow(row.status === 'confirmed' ? row.stage : 'to_fit', row.acceptedAt, now);

async function installerEmail(tx: Tx, installerId: string) {
	const [row] = await tx.select({ email: user.email }).from(user).where(eq(user.id, installerId));
	if (!row) throw new Error(`installer ${installerId} missing`);
	return row.email;
}

/** Review input as the forms give it: one whole number of stars per aspect, and the text. */
export type ReviewInput = AspectStars & { text: string };

/**
 * Writes one side's review of the other. Refuses someone not on the booking (404), work not yet
 * accepted, a closed window or a second review from the same side (409) and stars or text out of
 * bounds (400). When the other side has already reviewed, both show from now on and they hear so;
 * otherwise the other side hears that a review waits for theirs.
 */
export async function submitReview(
	bookingId: string,
	authorId: string,
	side: ReviewSide,
	input: ReviewInput,
	now = new Date()
): Promise<{ ok: true; visibleFrom: Date } | Refusal> {
	const text = input.text.trim();
	if (text.length < REVIEW_TEXT_MIN || text.length > REVIEW_TEXT_MAX) {
		return refuse(
			400,
			`Write between ${String(REVIEW_TEXT_MIN)} and ${String(REVIEW_TEXT_MAX)} characters.`,
			{ fields: { text: 'Out of bounds' } }
		);
	}
	let overall: number;
	try {
		overall = overallStars(side, input);
	} catch {
		return refuse(400, 'Choose from 1 to 5 stars for every aspect.');
	}
	const aspects = Object.fromEntries(aspectsOf(side).map((a) => [a, input[a] as number]));
	return withMail(async (tx, mail) => {
		const row = await readBooking(tx, bookingId, true);
		if (!row || !isParty(row, side, authorId)) return refuse(404, NOT_YOURS);
		const window = windowOf(row, now);
		if (!window.open) {
			return window.reason === 'closed'
				? refuse(
						409,
						`The ${String(REVIEW_WINDOW_DAYS)} days to review this booking ended on ${formatDayTime(window.closesAt, row.timeZone, now)}.`
					)
				: refuse(409, 'You can review this booking once the work is confirmed.');
		}
		const written = await tx
			.select({ id: review.id, side: review.side, createdAt: review.createdAt })
			.from(review)
			.where(eq(review.bookingId, bookingId));
		if (written.some((r) => r.side === side)) {
			return refuse(409, 'You have already reviewed this booking; a review cannot be changed.');
		}
		const theirs = written.find((r) => r.side !== side) ?? null;
		const visibleFrom = reviewVisibleFrom(window.closesAt, {
			owner: side === 'owner' ? now : (theirs?.createdAt ?? null),
			installer: side === 'installer' ? now : (theirs?.createdAt ?? null)
		});
		await tx.insert(review).values({
			bookingId,
			side,
			authorId,
			subjectId: side === 'owner' ? row.installerId : row.ownerId,
			aspects,
			overallStars: overall,
			text,
			visibleFrom,
			createdAt: now
		});
		const other = otherSide(side);
		const to = other === 'owner' ? row.ownerEmail : await installerEmail(tx, row.installerId);
		const displayName = other === 'owner' ? row.ownerName : row.businessName;
		const title = titleOrUntitled(row.title);
		const url = appUrl(reviewPath(other, bookingId));
		if (theirs) {
			await tx.update(review).set({ visibleFrom }).where(eq(review.id, theirs.id));
			await mail.send(to, { template: 'reviews-visible', data: { displayName, title, url } });
		} else {
			await mail.send(to, {
				template: 'review-received',
				data: {
					displayName,
					authorName: side === 'owner' ? row.ownerName : row.businessName,
					title,
					visibleOn: formatDayTime(visibleFrom, row.timeZone, now),
					url
				}
			});
		}
		return { ok: true as const, visibleFrom };
	});
}

/**
 * The installer's one public reply to the owner's review, once that review shows. A second reply
 * is refused (409), as is a reply before the review shows.
 */
export async function replyToReview(
	bookingId: string,
	installerId: string,
	reply: string,
	now = new Date()
): Promise<{ ok: true } | Refusal> {
	const words = reply.trim();
	if (words.length < 1 || words.length > REVIEW_REPLY_MAX) {
		return refuse(400, `Write between 1 and ${String(REVIEW_REPLY_MAX)} characters.`);
	}
	return db.transaction(async (tx) => {
		const row = await readBooking(tx, bookingId, true);
		if (!row || row.installerId !== installerId) return refuse(404, NOT_YOURS);
		const [ownerReview] = await tx
			.select({ id: review.id, visibleFrom: review.visibleFrom, reply: review.reply })
			.from(review)
			.where(and(eq(review.bookingId, bookingId), eq(review.side, 'owner')));
		if (!ownerReview) return refuse(409, 'The owner has not reviewed this booking.');
		if (ownerReview.reply !== null) {
			return refuse(409, 'You have already replied to this review; a reply cannot be changed.');
		}
		if (!mayReply(ownerReview, now)) {
			return refuse(409, 'You can reply once the owner’s review shows.');
		}
		await tx
			.update(review)
			.set({ reply: words, repliedAt: now })
			.where(and(eq(review.id, ownerReview.id), isNull(review.reply)));
		return { ok: true as const };
	});
}

/** A review as a page shows it: aspect labels and stars, the overall star, text and reply. */
function reviewView(r: Review) {
	return {
		side: r.side,
		aspects: aspectsOf(r.side).map((aspect) => ({
			aspect,
			label: REVIEW_ASPECT_LABELS[aspect],
			stars: r.aspects[aspect] ?? 0
		})),
		overall: r.overallStars,
		text: r.text,
		reply: r.reply,
		createdAt: r.createdAt.toISOString(),
		repliedAt: r.repliedAt?.toISOString() ?? null
	};
}
export type ReviewView = ReturnType<typeof reviewView>;

/**
 * What one side of a booking sees of its reviews at `now`: their own, the other side's only once
 * it shows (before that, when it will), and what they may do. Null when they are not on it.
 */
export async function getReviewPanel(
	bookingId: string,
	userId: string,
	side: ReviewSide,
	now = new Date()
) {
	const row = await readBooking(db, bookingId, false);
	if (!row || !isParty(row, side, userId)) return null;
	const window = windowOf(row, now);
	const rows = await db.select().from(review).where(eq(review.bookingId, bookingId));
	const mine = rows.find((r) => r.side === side) ?? null;
	const theirs = rows.find((r) => r.side !== side) ?? null;
	const state = theirReviewState(theirs, now);
	const ownerReview = rows.find((r) => r.side === 'owner') ?? null;
	return {
		bookingId,
		jobId: row.jobId,
		side,
		path: reviewPath(side, bookingId),
		title: titleOrUntitled(row.title),
		otherName: side === 'owner' ? row.businessName : row.ownerName,
		installerName: row.businessName,
		accepted: window.open || window.reason === 'closed',
		windowOpen: window.open,
		closesOn: window.closesAt ? formatDayTime(window.closesAt, row.timeZone, now) : null,
		mine: mine && {
			...reviewView(mine),
			visibleOn: formatDayTime(mine.visibleFrom, row.timeZone, now),
			shows: mine.visibleFrom.getTime() <= now.getTime()
		},
		theirs:
			state.kind === 'visible' && theirs
				? { kind: 'visible' as const, review: reviewView(theirs) }
				: state.kind === 'waiting'
					? {
							kind: 'waiting' as const,
							visibleOn: formatDayTime(state.visibleOn, row.timeZone, now)
						}
					: { kind: 'none' as const },
		mayWrite: window.open && !mine,
		mayReply: side === 'installer' && mayReply(ownerReview, now)
	};
}
export type ReviewPanel = NonNullable<Awaited<ReturnType<typeof getReviewPanel>>>;

/** Reviews on one page of an installer's public profile. */
export const PROFILE_REVIEWS_PER_PAGE = 10;

/** Sum of overall stars and number of an installer's owner reviews that show at `now`. */
function visibleOwnerReviews(now: Date) {
	return and(eq(review.side, 'owner'), lte(review.visibleFrom, now));
}

/**
 * The ratings the quote ranking uses: for each installer, the sum of the overall stars (each the
 * mean of its aspects, see $lib/work/reviews overallStars) of the owners' reviews that show at `now`,
 * and how many. One grouped query; installers without any are missing from the map.
 */
export async function installerRatings(installerIds: readonly string[], now = new Date()) {
	const ratings = new Map<string, { sum: number; count: number }>();
	if (installerIds.length === 0) return ratings;
	const rows = await db
		.select({
			installerId: review.subjectId,
			sum: sql<number>`sum(${review.overallStars})`.mapWith(Number),
			count: count()
		})
		.from(review)
		.where(and(inArray(review.subjectId, [...installerIds]), visibleOwnerReviews(now)))
		.groupBy(review.subjectId);
	for (const r of rows) ratings.set(r.installerId, { sum: r.sum, count: r.count });
	return ratings;
}

/**
 * An installer's public reviews at `now`, newest first, one page (with whether more follow), with
 * the rating totals and each aspect's mean over every review that shows.
 * @param page 1-based page number
 */
export async function listInstallerReviews(installerId: string, page: number, now = new Date()) {
	const where = and(eq(review.subjectId, installerId), visibleOwnerReviews(now));
	const [rows, [totals]] = await Promise.all([
		db
			.select({ review, ownerName: user.displayName, timeZone: job.timeZone })
			.from(review)
			.innerJoin(user, eq(user.id, review.authorId))
			.innerJoin(booking, eq(booking.id, review.bookingId))
			.innerJoin(job, eq(job.id, booking.jobId))
			.where(where)
			.orderBy(desc(review.createdAt), desc(review.id))
			.limit(PROFILE_REVIEWS_PER_PAGE + 1)
			.offset((page - 1) * PROFILE_REVIEWS_PER_PAGE),
		db
			.select({
				count: count(),
				sum: sql<number>`coalesce(sum(${review.overallStars}), 0)`.mapWith(Number),
				...Object.fromEntries(
					OWNER_ASPECTS.map((a) => [
						a,
						sql<number | null>`avg((${review.aspects} ->> ${a})::numeric)`.mapWith((v) =>
							v === null ? null : Number(v)
						)
					])
				)
			})
			.from(review)
			.where(where)
	]);
	const t = totals as { count: number; sum: number } & Record<string, number | null>;
	return {
		count: t.count,
		sum: t.sum,
		aspects: OWNER_ASPECTS.map((aspect) => ({
			aspect,
			label: REVIEW_ASPECT_LABELS[aspect],
			average: t[aspect] ?? null
		})),
		more: rows.length > PROFILE_REVIEWS_PER_PAGE,
		reviews: rows.slice(0, PROFILE_REVIEWS_PER_PAGE).map((r) => ({
			id: r.review.id,
			...reviewView(r.review),
			// First name only: a public page says no more about an owner than that.
			author: r.ownerName.trim().split(/\s+/)[0] || 'An owner',
			writtenOn: formatDay(r.review.createdAt, r.timeZone, now),
			repliedOn: r.review.repliedAt ? formatDay(r.review.repliedAt, r.timeZone, now) : null
		}))
	};
}
export type InstallerReviewPage = Awaited<ReturnType<typeof listInstallerReviews>>;

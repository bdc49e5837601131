// Reviews after accepted work, both ways. Rules: the lifecycle issue (Tapline's own): 14 days from
// acceptance, one review per side, hidden until both have reviewed or the window has closed, one
// public reply by the installer; only reviews that show feed the ratings.
import { and, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { confirmWork, openConfirmationWindow } from '$lib/server/work/completion';
import { db } from '$lib/server/db';
import { emailOutbox, review, user } from '$lib/server/db/schema';
import { withMail } from '$lib/server/mail/outbox';
import { listQuotesForOwner } from '$lib/server/marketplace/quotes';
import {
	getReviewPanel,
	installerRatings,
	listInstallerReviews,
	replyToReview,
	submitReview
} from '$lib/server/work/reviews';
import { makeUser } from './matching-helpers';
import { paidBookingIn, startPaymentsWorld, type PaymentsWorld } from './payments-helpers';

let world: PaymentsWorld;
beforeAll(async () => {
	world = await startPaymentsWorld();
});
afterAll(() => world.close());

const HOUR = 3_600_000;
const DAY = 24 * HOUR;

const OWNER_REVIEW = {
	workmanship: 5,
	tidiness: 4,
	communication: 4,
	punctuality: 4,
	text: 'Neat work, wiring hidden along the pillar and a clear walk-through.'
};
const INSTALLER_REVIEW = {
	vehicleReady: 5,
	communication: 5,
	accurateJob: 3,
	text: 'Car was ready on time; the job said one camera, it was two.'
};

/** A paid booking moved to accepted by the owner's confirmation; returns it and when. */
async function acceptedBooking(count = 1) {
	const made = await paidBookingIn(world, count);
	// Reported three hours ago, so the reviews written below sit in the past of the real clock.
	const reportedAt = new Date(Date.now() - 3 * HOUR);
	const opened = await withMail((tx, mail) =>
		openConfirmationWindow(tx, mail, made.bookingId, reportedAt)
	);
	if (!opened.ok) throw new Error(opened.message);
	const acceptedAt = new Date(reportedAt.getTime() + HOUR);
	const confirmed = await confirmWork(made.bookingId, made.ownerId, acceptedAt);
	if (!confirmed.ok) throw new Error(confirmed.message);
	return { ...made, installerId: made.chosen.installerId, acceptedAt };
}

async function emailOf(id: string) {
	const [row] = await db.select({ email: user.email }).from(user).where(eq(user.id, id));
	return row!.email;
}
async function mailsTo(template: string, to: string) {
	return db
		.select()
		.from(emailOutbox)
		.where(and(eq(emailOutbox.template, template), eq(emailOutbox.toAddress, to)));
}
const after = (at: Date, ms: number) => new Date(at.getTime() + ms);

describe('the owner reviewing the installer', () => {
	it('is refused before the work is accepted, then written once and hidden from the installer', async () => {
		const made = await paidBookingIn(world);
		expect(await submitReview(made.bookingId, made.ownerId, 'owner', OWNER_REVIEW)).toMatchObject({
			ok: false,
			status: 409
		});
		const b = await acceptedBooking();
		const at = after(b.acceptedAt, DAY);
		const written = await submitReview(b.bookingId, b.ownerId, 'owner', OWNER_REVIEW, at);
		expect(written).toEqual({ ok: true, visibleFrom: after(b.acceptedAt, 14 * DAY) });
		const [row] = await db.select().from(review).where(eq(review.bookingId, b.bookingId));
		// Overall star: the mean of 5, 4, 4, 4.
		expect(row).toMatchObject({ side: 'owner', subjectId: b.installerId, overallStars: 4.25 });

		// A second review from the same side is refused, and so is the wrong person.
		expect(await submitReview(b.bookingId, b.ownerId, 'owner', OWNER_REVIEW, at)).toMatchObject({
			ok: false,
			status: 409
		});
		const stranger = await makeUser('owner', 'stranger');
		expect(await submitReview(b.bookingId, stranger.id, 'owner', OWNER_REVIEW, at)).toMatchObject({
			ok: false,
			status: 404
		});
		expect(await getReviewPanel(b.bookingId, stranger.id, 'owner', at)).toBeNull();
		// The owner cannot pose as the installer's side of their own booking.
		expect(
			await submitReview(b.bookingId, b.ownerId, 'installer', INSTALLER_REVIEW, at)
		).toMatchObject({ ok: false, status: 404 });

		// The author sees their own; the installer only that one waits, and until when.
		const ownerPanel = await getReviewPanel(b.bookingId, b.ownerId, 'owner', at);
		expect(ownerPanel).toMatchObject({ mayWrite: false, theirs: { kind: 'none' } });
		expect(ownerPanel?.mine?.text).toBe(OWNER_REVIEW.text);
		const installerPanel = await getReviewPanel(b.bookingId, b.installerId, 'installer', at);
		expect(installerPanel).toMatchObject({ mayWrite: true, mayReply: false });
		expect(installerPanel?.theirs.kind).toBe('waiting');
		expect(JSON.stringify(installerPanel)).not.toContain(OWNER_REVIEW.text);
		expect(await mailsTo('review-received', await emailOf(b.installerId))).toHaveLength(1);

		// Hidden reviews are not public and do not count.
		expect((await listInstallerReviews(b.installerId, 1, at)).count).toBe(0);
		expect((await installerRatings([b.installerId], at)).get(b.installerId)).toBeUndefined();
	});

	it('refuses stars or text out of bounds without writing anything', async () => {
		const b = await acceptedBooking();
		const at = after(b.acceptedAt, HOUR);
		const bad = [
			{ ...OWNER_REVIEW, tidiness: 6 },
			{ ...OWNER_REVIEW, punctuality: 2.5 },
			{ ...OWNER_REVIEW, text: 'short' },
			{ ...OWNER_REVIEW, text: 'x'.repeat(2001) }
		];
		for (const input of bad) {
			expect(await submitReview(b.bookingId, b.ownerId, 'owner', input, at)).toMatchObject({
				ok: false,
				status: 400
			});
		}
		expect(await db.select().from(review).where(eq(review.bookingId, b.bookingId))).toEqual([]);
	});
});

describe('the installer reviewing the owner', () => {
	it('shows both reviews to both sides as soon as the second is written', async () => {
		const b = await acceptedBooking();
		const ownerAt = after(b.acceptedAt, 2 * DAY);
		const installerAt = after(b.acceptedAt, 3 * DAY);
		await submitReview(b.bookingId, b.ownerId, 'owner', OWNER_REVIEW, ownerAt);
		const second = await submitReview(
			b.bookingId,
			b.installerId,
			'installer',
			INSTALLER_REVIEW,
			installerAt
		);
		expect(second).toEqual({ ok: true, visibleFrom: installerAt });
		const owner = await getReviewPanel(b.bookingId, b.ownerId, 'owner', installerAt);
		expect(owner?.theirs).toMatchObject({
			kind: 'visible',
			review: { text: INSTALLER_REVIEW.text, overall: 13 / 3 }
		});
		const installer = await getReviewPanel(b.bookingId, b.installerId, 'installer', installerAt);
		expect(installer?.theirs).toMatchObject({
			kind: 'visible',
			review: { text: OWNER_REVIEW.text }
		});
		expect(installer?.mayReply).toBe(true);
		expect(await mailsTo('reviews-visible', await emailOf(b.ownerId))).toHaveLength(1);
		// One review the installer wrote first, then the owner's: the same both ways.
		const profile = await listInstallerReviews(b.installerId, 1, installerAt);
		expect(profile.count).toBe(1);
		expect(profile.reviews[0]).toMatchObject({ text: OWNER_REVIEW.text, overall: 4.25 });
		expect(profile.aspects.find((a) => a.aspect === 'workmanship')?.average).toBe(5);
	});

	it('written first, it stays hidden from the owner until the owner reviews', async () => {
		const b = await acceptedBooking();
		const at = after(b.acceptedAt, HOUR);
		await submitReview(b.bookingId, b.installerId, 'installer', INSTALLER_REVIEW, at);
		const owner = await getReviewPanel(b.bookingId, b.ownerId, 'owner', at);
		expect(owner?.theirs.kind).toBe('waiting');
		expect(JSON.stringify(owner)).not.toContain(INSTALLER_REVIEW.text);
		expect(await mailsTo('review-received', await emailOf(b.ownerId))).toHaveLength(1);
		const ownerAt = after(at, HOUR);
		await submitReview(b.bookingId, b.ownerId, 'owner', OWNER_REVIEW, ownerAt);
		expect((await getReviewPanel(b.bookingId, b.ownerId, 'owner', ownerAt))?.theirs.kind).toBe(
			'visible'
		);
	});
});

describe('both sides at once', () => {
	it('serialises on the booking, so both reviews show from the second one', async () => {
		const b = await acceptedBooking();
		const at = after(b.acceptedAt, DAY);
		const [o, i] = await Promise.all([
			submitReview(b.bookingId, b.ownerId, 'owner', OWNER_REVIEW, at),
			submitReview(b.bookingId, b.installerId, 'installer', INSTALLER_REVIEW, at)
		]);
		expect([o.ok, i.ok]).toEqual([true, true]);
		const rows = await db.select().from(review).where(eq(review.bookingId, b.bookingId));
		expect(rows.map((r) => r.visibleFrom.getTime())).toEqual([at.getTime(), at.getTime()]);
		// Both sent the same second a review is written; one e-mail says both now show.
		const told = [
			...(await mailsTo('reviews-visible', await emailOf(b.ownerId))),
			...(await mailsTo('reviews-visible', await emailOf(b.installerId)))
		];
		expect(told).toHaveLength(1);
	});
});

describe('the window closing', () => {
	it('shows a lone review at the close and refuses reviews from then on', async () => {
		const b = await acceptedBooking();
		const closes = after(b.acceptedAt, 14 * DAY);
		await submitReview(b.bookingId, b.ownerId, 'owner', OWNER_REVIEW, after(b.acceptedAt, DAY));
		const justBefore = new Date(closes.getTime() - 1);
		expect(
			(await getReviewPanel(b.bookingId, b.installerId, 'installer', justBefore))?.theirs.kind
		).toBe('waiting');
		expect((await listInstallerReviews(b.installerId, 1, justBefore)).count).toBe(0);
		const panel = await getReviewPanel(b.bookingId, b.installerId, 'installer', closes);
		expect(panel).toMatchObject({
			windowOpen: false,
			mayWrite: false,
			theirs: { kind: 'visible' }
		});
		expect((await listInstallerReviews(b.installerId, 1, closes)).count).toBe(1);
		expect(
			await submitReview(b.bookingId, b.installerId, 'installer', INSTALLER_REVIEW, closes)
		).toMatchObject({ ok: false, status: 409 });
		// One millisecond earlier it would still have been taken.
		const other = await acceptedBooking();
		const lastMoment = new Date(after(other.acceptedAt, 14 * DAY).getTime() - 1);
		expect(
			await submitReview(
				other.bookingId,
				other.installerId,
				'installer',
				INSTALLER_REVIEW,
				lastMoment
			)
		).toMatchObject({ ok: true });
	});
});

describe('the installer’s reply', () => {
	it('is refused before the review shows, taken once after, and shown on the profile', async () => {
		const b = await acceptedBooking();
		const at = after(b.acceptedAt, DAY);
		await submitReview(b.bookingId, b.ownerId, 'owner', OWNER_REVIEW, at);
		expect(await replyToReview(b.bookingId, b.installerId, 'Thank you!', at)).toMatchObject({
			ok: false,
			status: 409
		});
		const shows = after(b.acceptedAt, 14 * DAY);
		const stranger = await makeUser('installer', 'other-installer');
		expect(await replyToReview(b.bookingId, stranger.id, 'Thank you!', shows)).toMatchObject({
			ok: false,
			status: 404
		});
		expect(await replyToReview(b.bookingId, b.installerId, '   ', shows)).toMatchObject({
			ok: false,
			status: 400
		});
		expect(await replyToReview(b.bookingId, b.installerId, 'Thank you!', shows)).toEqual({
			ok: true
		});
		expect(await replyToReview(b.bookingId, b.installerId, 'Again', shows)).toMatchObject({
			ok: false,
			status: 409
		});
		const profile = await listInstallerReviews(b.installerId, 1, shows);
		expect(profile.reviews[0]?.reply).toBe('Thank you!');
		expect((await getReviewPanel(b.bookingId, b.installerId, 'installer', shows))?.mayReply).toBe(
			false
		);
	});
});

describe('ratings in the quote list', () => {
	it('counts the owner’s review once it shows, as the mean of its aspects', async () => {
		const b = await acceptedBooking(2);
		const other = b.installers.find((i) => i.id !== b.installerId)!;
		await submitReview(b.bookingId, b.ownerId, 'owner', OWNER_REVIEW, after(b.acceptedAt, HOUR));
		const before = await listQuotesForOwner(b.job.id, b.ownerId);
		expect(before?.find((q) => q.installerId === b.installerId)).toMatchObject({
			ratingSum: 0,
			ratingCount: 0
		});
		// The installer's review makes both show now (the list reads at the real clock).
		await submitReview(b.bookingId, b.installerId, 'installer', INSTALLER_REVIEW, new Date());
		const rows = await listQuotesForOwner(b.job.id, b.ownerId);
		expect(rows?.find((q) => q.installerId === b.installerId)).toMatchObject({
			ratingSum: 4.25,
			ratingCount: 1
		});
		expect(rows?.find((q) => q.installerId === other.id)).toMatchObject({
			ratingSum: 0,
			ratingCount: 0
		});
		// The installer's review of the owner is no rating of an installer.
		expect((await installerRatings([b.ownerId])).get(b.ownerId)).toBeUndefined();
	});
});

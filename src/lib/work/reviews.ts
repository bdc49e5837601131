/**
 * Reviews after a booking's work is accepted (Tapline's rules, from the lifecycle issue): each
 * side rates the other once, 1 to 5 stars on a few named aspects plus a few words, within
 * {@link REVIEW_WINDOW_DAYS} days of acceptance. Neither review is shown to anyone but its author
 * until both sides have reviewed or the window has closed, so neither side can answer a review
 * with a retaliating one. The installer may answer the owner's review once, in public, after it
 * shows. Pure (no I/O); the server module stores what these functions decide.
 */
import type { FitStageName } from './lifecycle';

/** Who wrote a review: the owner (about the installer) or the installer (about the owner). */
export const REVIEW_SIDES = ['owner', 'installer'] as const;
export type ReviewSide = (typeof REVIEW_SIDES)[number];

/** What the owner rates the installer on (Tapline's own aspects). */
export const OWNER_ASPECTS = ['workmanship', 'tidiness', 'communication', 'punctuality'] as const;
/** What the installer rates the owner on (Tapline's own aspects). */
export const INSTALLER_ASPECTS = ['vehicleReady', 'communication', 'accurateJob'] as const;

export type OwnerAspect = (typeof OWNER_ASPECTS)[number];
export type InstallerAspect = (typeof INSTALLER_ASPECTS)[number];
export type ReviewAspect = OwnerAspect | InstallerAspect;
export type AspectStars = Partial<Record<ReviewAspect, number>>;

/** The aspects one side rates. */
export const aspectsOf = (side: ReviewSide): readonly ReviewAspect[] =>
	side === 'owner' ? OWNER_ASPECTS : INSTALLER_ASPECTS;

/** The other side of a booking. */
export const otherSide = (side: ReviewSide): ReviewSide =>
	side === 'owner' ? 'installer' : 'owner';

/** Days after acceptance in which both sides may review (Tapline's rule, the lifecycle issue). */
export const REVIEW_WINDOW_DAYS = 14;
export const REVIEW_STARS_MIN = 1;
export const REVIEW_STARS_MAX = 5;
/** Text bounds (Tapline's choice: a sentence at least, a few paragraphs at most). */
export const REVIEW_TEXT_MIN = 10;
export const REVIEW_TEXT_MAX = 2000;
export const REVIEW_REPLY_MAX = 1000;

const DAY_MS = 86_400_000;

/** Stages whose work counts as accepted, so reviews may be written. */
export const REVIEWABLE_STAGES: readonly FitStageName[] = ['accepted', 'settled'];

/**
 * When the review window closes: {@link REVIEW_WINDOW_DAYS} × 24 hours after acceptance, in exact
 * hours like the confirmation window (a daylight-saving change in between does not move it).
 */
export function reviewWindowCloses(acceptedAt: Date): Date {
	return new Date(acceptedAt.getTime() + REVIEW_WINDOW_DAYS * DAY_MS);
}

export type ReviewWindow =
	| { open: true; closesAt: Date }
	| { open: false; reason: 'not-accepted'; closesAt: null }
	| { open: false; reason: 'closed'; closesAt: Date };

/**
 * Whether a review may be written now: the work is accepted (or settled) and `now` is before the
 * window closes (the closing instant itself is outside).
 */
export function reviewWindow(
	stage: FitStageName,
	acceptedAt: Date | null,
	now: Date
): ReviewWindow {
	if (!REVIEWABLE_STAGES.includes(stage) || !acceptedAt) {
		return { open: false, reason: 'not-accepted', closesAt: null };
	}
	const closesAt = reviewWindowCloses(acceptedAt);
	return now.getTime() < closesAt.getTime()
		? { open: true, closesAt }
		: { open: false, reason: 'closed', closesAt };
}

/**
 * From when a review shows to the other side and the public: the moment the second review was
 * written when both sides reviewed in time, else the window's close.
 * @param closesAt the review window's close
 * @param writtenAt when each side's review was written (null for a side that has not)
 */
export function reviewVisibleFrom(
	closesAt: Date,
	writtenAt: { owner: Date | null; installer: Date | null }
): Date {
	const { owner, installer } = writtenAt;
	if (owner && installer) {
		const second = Math.max(owner.getTime(), installer.getTime());
		return new Date(Math.min(second, closesAt.getTime()));
	}
	return closesAt;
}

/** Whether a review with this visible-from instant shows at `now` (from that instant on). */
export const isReviewVisible = (visibleFrom: Date, now: Date): boolean =>
	now.getTime() >= visibleFrom.getTime();

/**
 * The review's overall stars: the plain mean of its aspect stars, unrounded (so 5, 4, 4, 4 is
 * 4.25). Every aspect counts the same; this overall star is what the ratings add up.
 * @throws RangeError when an aspect of the side is missing or out of 1..5 whole stars
 */
export function overallStars(side: ReviewSide, stars: AspectStars): number {
	const aspects = aspectsOf(side);
	let sum = 0;
	for (const aspect of aspects) {
		const value = stars[aspect];
		if (
			value === undefined ||
			!Number.isInteger(value) ||
			value < REVIEW_STARS_MIN ||
			value > REVIEW_STARS_MAX
		) {
			throw new RangeError(`${aspect} needs 1 to 5 whole stars`);
		}
		sum += value;
	}
	return sum / aspects.length;
}

/**
 * Each aspect's mean over many reviews (null for an aspect no review rated), for a profile's
 * breakdown.
 */
export function aspectAverages(
	side: ReviewSide,
	reviews: readonly AspectStars[]
): Record<string, number | null> {
	const result: Record<string, number | null> = {};
	for (const aspect of aspectsOf(side)) {
		const values = reviews.map((r) => r[aspect]).filter((v): v is number => v !== undefined);
		result[aspect] = values.length ? values.reduce((a, b) => a + b, 0) / values.length : null;
	}
	return result;
}

/** What a reader may see of the other side's review. */
export type TheirReviewState =
	/** Not written, and the window is still open. */
	| { kind: 'none' }
	/** Written, hidden until `visibleOn` (or until the reader reviews). */
	| { kind: 'waiting'; visibleOn: Date }
	| { kind: 'visible' };

/**
 * What one side sees of the other's review at `now`.
 * @param theirs when the other review was written and from when it shows, or null
 */
export function theirReviewState(
	theirs: { visibleFrom: Date } | null,
	now: Date
): TheirReviewState {
	if (!theirs) return { kind: 'none' };
	return isReviewVisible(theirs.visibleFrom, now)
		? { kind: 'visible' }
		: { kind: 'waiting', visibleOn: theirs.visibleFrom };
}

/**
 * Whether the installer may reply now: the owner's review shows and has no reply yet.
 */
export function mayReply(
	ownerReview: { visibleFrom: Date; reply: string | null } | null,
	now: Date
): boolean {
	return (
		!!ownerReview && ownerReview.reply === null && isReviewVisible(ownerReview.visibleFrom, now)
	);
}

// Review rules are Tapline's own (the lifecycle issue): 14 days from acceptance, hidden until both
// sides have reviewed or the window closes, overall star = the plain mean of the aspects.
import { describe, expect, it } from 'vitest';
import { NUL_MESSAGE } from '../forms/fields';
import { installerReviewSchema, ownerReviewSchema, reviewReplySchema } from '../forms/review';
import { FIT_STAGES } from './lifecycle';
import {
	aspectAverages,
	INSTALLER_ASPECTS,
	isReviewVisible,
	mayReply,
	OWNER_ASPECTS,
	overallStars,
	REVIEWABLE_STAGES,
	reviewVisibleFrom,
	reviewWindow,
	reviewWindowCloses,
	theirReviewState
} from './reviews';

const HOUR = 3_600_000;
const acceptedAt = new Date('2026-12-01T03:00:00Z');
// 14 × 24 h after acceptance (the lifecycle issue's 14 days, in exact hours).
const closesAt = new Date('2026-12-15T03:00:00Z');

describe('the review window', () => {
	it('closes exactly 14 × 24 hours after acceptance', () => {
		expect(reviewWindowCloses(acceptedAt)).toEqual(closesAt);
	});

	it('stays 336 hours across the daylight-saving start in Adelaide (4 Oct 2026)', () => {
		// Adelaide clocks go forward at 2 am on Sunday 4 October 2026 (SA daylight saving, first
		// Sunday in October; from memory): the window still lasts 336 real hours.
		const before = new Date('2026-09-30T00:00:00Z');
		expect(reviewWindowCloses(before).getTime() - before.getTime()).toBe(336 * HOUR);
	});

	it('is open from acceptance up to, not including, the closing instant', () => {
		expect(reviewWindow('accepted', acceptedAt, acceptedAt)).toEqual({ open: true, closesAt });
		expect(reviewWindow('accepted', acceptedAt, new Date(closesAt.getTime() - 1))).toEqual({
			open: true,
			closesAt
		});
		expect(reviewWindow('accepted', acceptedAt, closesAt)).toEqual({
			open: false,
			reason: 'closed',
			closesAt
		});
	});

	it('opens only for accepted or settled work', () => {
		for (const stage of FIT_STAGES) {
			const open = reviewWindow(stage, acceptedAt, acceptedAt).open;
			expect({ stage, open }).toEqual({ stage, open: REVIEWABLE_STAGES.includes(stage) });
		}
		expect(reviewWindow('accepted', null, acceptedAt)).toMatchObject({
			open: false,
			reason: 'not-accepted'
		});
	});
});

describe('when a review shows', () => {
	const ownerAt = new Date(acceptedAt.getTime() + 2 * HOUR);
	const installerAt = new Date(acceptedAt.getTime() + 50 * HOUR);

	it('shows at the window close while only one side has reviewed', () => {
		expect(reviewVisibleFrom(closesAt, { owner: ownerAt, installer: null })).toEqual(closesAt);
		expect(reviewVisibleFrom(closesAt, { owner: null, installer: installerAt })).toEqual(closesAt);
	});

	it('shows from the second review once both sides have reviewed', () => {
		expect(reviewVisibleFrom(closesAt, { owner: ownerAt, installer: installerAt })).toEqual(
			installerAt
		);
		expect(reviewVisibleFrom(closesAt, { owner: installerAt, installer: ownerAt })).toEqual(
			installerAt
		);
	});

	it('never later than the window close', () => {
		const late = new Date(closesAt.getTime() + HOUR);
		expect(reviewVisibleFrom(closesAt, { owner: ownerAt, installer: late })).toEqual(closesAt);
	});

	it('is hidden before the instant and shown from it', () => {
		expect(isReviewVisible(closesAt, new Date(closesAt.getTime() - 1))).toBe(false);
		expect(isReviewVisible(closesAt, closesAt)).toBe(true);
	});

	it('over time: hidden, then waiting with a date, then visible when the other side reviews', () => {
		// Owner reviews first: the installer sees "waiting until the close".
		const first = { visibleFrom: reviewVisibleFrom(closesAt, { owner: ownerAt, installer: null }) };
		expect(theirReviewState(null, ownerAt)).toEqual({ kind: 'none' });
		expect(theirReviewState(first, ownerAt)).toEqual({ kind: 'waiting', visibleOn: closesAt });
		// The installer reviews: both show from that moment.
		const both = {
			visibleFrom: reviewVisibleFrom(closesAt, { owner: ownerAt, installer: installerAt })
		};
		expect(theirReviewState(both, new Date(installerAt.getTime() - 1)).kind).toBe('waiting');
		expect(theirReviewState(both, installerAt)).toEqual({ kind: 'visible' });
		// Had the installer never reviewed, the owner's shows at the close.
		expect(theirReviewState(first, closesAt)).toEqual({ kind: 'visible' });
	});
});

describe('overall stars and aspect averages', () => {
	it('is the plain mean of the aspects, unrounded', () => {
		expect(
			overallStars('owner', { workmanship: 5, tidiness: 4, communication: 4, punctuality: 4 })
		).toBe(4.25);
		expect(overallStars('installer', { vehicleReady: 5, communication: 4, accurateJob: 4 })).toBe(
			13 / 3
		);
	});

	it('refuses a missing aspect, a half star or a star out of 1..5', () => {
		expect(() => overallStars('owner', { workmanship: 5, tidiness: 4, communication: 4 })).toThrow(
			'punctuality'
		);
		expect(() =>
			overallStars('installer', { vehicleReady: 4.5, communication: 4, accurateJob: 4 })
		).toThrow(RangeError);
		expect(() =>
			overallStars('installer', { vehicleReady: 0, communication: 4, accurateJob: 4 })
		).toThrow(RangeError);
		expect(() =>
			overallStars('installer', { vehicleReady: 6, communication: 4, accurateJob: 4 })
		).toThrow(RangeError);
	});

	it('averages each aspect over many reviews', () => {
		const averages = aspectAverages('owner', [
			{ workmanship: 5, tidiness: 3, communication: 4, punctuality: 2 },
			{ workmanship: 4, tidiness: 4, communication: 4, punctuality: 5 }
		]);
		expect(averages).toEqual({
			workmanship: 4.5,
			tidiness: 3.5,
			communication: 4,
			punctuality: 3.5
		});
		expect(Object.keys(aspectAverages('installer', []))).toEqual([...INSTALLER_ASPECTS]);
		expect(aspectAverages('owner', [])).toEqual(
			Object.fromEntries(OWNER_ASPECTS.map((a) => [a, null]))
		);
	});
});

describe('the installer’s reply', () => {
	it('is allowed once, and only after the owner’s review shows', () => {
		expect(mayReply(null, closesAt)).toBe(false);
		expect(mayReply({ visibleFrom: closesAt, reply: null }, new Date(closesAt.getTime() - 1))).toBe(
			false
		);
		expect(mayReply({ visibleFrom: closesAt, reply: null }, closesAt)).toBe(true);
		expect(mayReply({ visibleFrom: closesAt, reply: 'Thanks' }, closesAt)).toBe(false);
	});
});

describe('the review forms', () => {
	const good = { vehicleReady: 5, communication: 4, accurateJob: 3, text: 'Ready on time.' };

	it('take whole stars 1..5 and 10 to 2,000 characters, trimmed', () => {
		expect(
			installerReviewSchema.safeParse({ ...good, text: '  Ready on time.  ' }).data?.text
		).toBe('Ready on time.');
		for (const bad of [0, 6, 2.5]) {
			expect(installerReviewSchema.safeParse({ ...good, accurateJob: bad }).success).toBe(false);
		}
		expect(installerReviewSchema.safeParse({ ...good, text: 'Too short' }).success).toBe(false);
		expect(installerReviewSchema.safeParse({ ...good, text: 'x'.repeat(2001) }).success).toBe(
			false
		);
		expect(ownerReviewSchema.safeParse(good).success).toBe(false);
	});

	it('refuse a NUL character in the text and the reply', () => {
		const text = installerReviewSchema.safeParse({ ...good, text: 'Ready on\u0000 time.' });
		expect(text.error?.issues.map((i) => i.message)).toContain(NUL_MESSAGE);
		const reply = reviewReplySchema.safeParse({ reply: 'Thanks\u0000' });
		expect(reply.error?.issues.map((i) => i.message)).toContain(NUL_MESSAGE);
	});
});

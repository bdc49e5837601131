/**
 * The review forms: the owner rates the installer, the installer rates the owner (each aspect 1 to
 * 5 whole stars, plus a few words), and the installer's one public reply.
 */
import { z } from 'zod';
import {
	REVIEW_REPLY_MAX,
	REVIEW_STARS_MAX,
	REVIEW_STARS_MIN,
	REVIEW_TEXT_MAX,
	REVIEW_TEXT_MIN
} from '../work/reviews';
import { textField } from './fields';

const stars = z
	.number({ error: 'Choose from 1 to 5 stars' })
	.int({ error: 'Choose from 1 to 5 stars' })
	.min(REVIEW_STARS_MIN, { error: 'Choose from 1 to 5 stars' })
	.max(REVIEW_STARS_MAX, { error: 'Choose from 1 to 5 stars' });

const reviewText = textField({ error: 'Write a few words about the booking' })
	.trim()
	.min(REVIEW_TEXT_MIN, {
		error: `Write at least ${String(REVIEW_TEXT_MIN)} characters about the booking`
	})
	.max(REVIEW_TEXT_MAX, {
		error: `Keep it to ${REVIEW_TEXT_MAX.toLocaleString('en-AU')} characters or fewer`
	});

/** The owner's review of the installer. */
export const ownerReviewSchema = z.object({
	workmanship: stars,
	tidiness: stars,
	communication: stars,
	punctuality: stars,
	text: reviewText
});

/** The installer's review of the owner. */
export const installerReviewSchema = z.object({
	vehicleReady: stars,
	communication: stars,
	accurateJob: stars,
	text: reviewText
});

/** The installer's one public reply to the owner's review. */
export const reviewReplySchema = z.object({
	reply: textField({ error: 'Write your reply' })
		.trim()
		.min(1, { error: 'Write your reply' })
		.max(REVIEW_REPLY_MAX, {
			error: `Keep it to ${REVIEW_REPLY_MAX.toLocaleString('en-AU')} characters or fewer`
		})
});

export type OwnerReviewForm = z.output<typeof ownerReviewSchema>;
export type InstallerReviewForm = z.output<typeof installerReviewSchema>;

/**
 * The star fields of a posted review whose value is not one plain digit from 1 to 5. The form
 * library reads a whole-number field with `parseInt`, so `1e308` or `3.5` would arrive as 1 or 3;
 * the posted text is checked here before that reading is trusted.
 */
export function starsNotWhole(
	data: FormData | null,
	schema: typeof ownerReviewSchema | typeof installerReviewSchema
): string[] {
	const fields = Object.keys(schema.shape).filter((field) => field !== 'text');
	return fields.filter((field) => !/^[1-5]$/.test(String(data?.get(field) ?? '')));
}

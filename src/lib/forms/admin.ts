/**
 * The admin's forms for accounts: the list's filters (a GET form) and the reason every change to
 * an account carries, with an explicit confirmation.
 */
import { z } from 'zod';
import type { BookingStatus } from '$lib/statuses';
import { isCalendarDate, textField } from './fields';
import { MAX_CONFIRMATION_WINDOW_HOURS, MIN_CONFIRMATION_WINDOW_HOURS } from '$lib/work/lifecycle';

export const USER_ROLES = ['owner', 'installer', 'admin'] as const;
export const ACCOUNT_STANDINGS = ['active', 'suspended'] as const;

/** The account list's query string; anything unknown falls back to "all". */
export const userQuerySchema = z.object({
	q: textField().max(100).catch(''),
	role: z.enum(USER_ROLES).or(z.literal('')).catch(''),
	standing: z.enum(ACCOUNT_STANDINGS).or(z.literal('')).catch(''),
	page: z.coerce.number().int().min(1).max(100_000).catch(1)
});

/** A change to an account: why (kept in the audit trail and, for a suspension, e-mailed). */
export const accountActionSchema = z.object({
	reason: textField({ error: 'Say why, in a few words' })
		.trim()
		.min(5, { error: 'Say why, in a few words (at least 5 characters)' })
		.max(300, { error: 'Keep the reason under 300 characters' }),
	// A boolean, not literal(true): superforms would tick a literal's box on the admin's behalf.
	confirm: z
		.boolean()
		.default(false)
		.refine((v) => v, { message: 'Tick the box to confirm' })
});

export const BOOKING_STATUSES = [
	'awaiting_payment',
	'confirmed',
	'cancelled',
	'lapsed'
] as const satisfies readonly BookingStatus[];

/** A calendar date in a query string, or '' when absent or not a real date. */
const queryDate = z.string().refine(isCalendarDate).catch('').or(z.literal(''));

/** The admin booking list's query string (and the CSV export's); unknown values mean "all". */
export const bookingQuerySchema = z.object({
	from: queryDate,
	to: queryDate,
	status: z.enum(BOOKING_STATUSES).or(z.literal('')).catch(''),
	q: textField().max(100).catch(''),
	page: z.coerce.number().int().min(1).max(100_000).catch(1)
});

/** The admin payout list's query string (and the CSV export's): release days, both included. */
export const payoutQuerySchema = z.object({
	from: queryDate,
	to: queryDate,
	page: z.coerce.number().int().min(1).max(100_000).catch(1)
});

/**
 * The market settings as an admin types them (percent and dollars); the server keeps basis
 * points and cents. Bounds are Tapline's own sanity limits, said in each message.
 */
export const marketSettingsSchema = z.object({
	feePercent: z
		.number({ error: 'Enter the fee as a percentage, e.g. 10' })
		.min(0, { error: 'The fee cannot be negative' })
		.max(30, { error: 'Keep the fee at 30 % or less' })
		.multipleOf(0.01, { error: 'Use at most two decimals, e.g. 9.5' }),
	feeMinimumDollars: z
		.number({ error: 'Enter the minimum fee in dollars' })
		.min(0, { error: 'The minimum cannot be negative' })
		.max(500, { error: 'Keep the minimum fee at $500 or less' })
		.multipleOf(0.01, { error: 'Use dollars and cents, e.g. 15.00' }),
	lateCancelFeeDollars: z
		.number({ error: 'Enter the late-cancellation fee in dollars' })
		.min(0, { error: 'The fee cannot be negative' })
		.max(1000, { error: 'Keep the late-cancellation fee at $1,000 or less' })
		.multipleOf(0.01, { error: 'Use dollars and cents, e.g. 50.00' }),
	minCoverDollars: z
		.number({ error: 'Enter the minimum cover in dollars' })
		.int({ error: 'Enter whole dollars' })
		.min(1_000_000, { error: 'The minimum cover must be at least $1,000,000' })
		.max(20_000_000, { error: 'Keep the minimum cover at $20,000,000 or less' }),
	confirmationWindowHours: z
		.number({ error: 'Enter the window in hours, e.g. 72' })
		.int({ error: 'Enter whole hours' })
		.min(MIN_CONFIRMATION_WINDOW_HOURS, {
			error: `Give owners at least ${String(MIN_CONFIRMATION_WINDOW_HOURS)} hours`
		})
		.max(MAX_CONFIRMATION_WINDOW_HOURS, {
			error: `Keep the window at ${String(MAX_CONFIRMATION_WINDOW_HOURS)} hours (14 days) or less`
		}),
	labourRateDollars: z
		.number({ error: 'Enter the labour rate in dollars per hour' })
		.min(30, { error: 'The labour rate guide must be at least $30 an hour' })
		.max(400, { error: 'Keep the labour rate guide at $400 an hour or less' })
		.multipleOf(0.01, { error: 'Use dollars and cents, e.g. 110.00' }),
	reason: textField({ error: 'Say why, in a few words' })
		.trim()
		.min(5, { error: 'Say why, in a few words (at least 5 characters)' })
		.max(300, { error: 'Keep the reason under 300 characters' })
});

/**
 * The admin's forms for accounts: the list's filters (a GET form) and the reason every change to
 * an account carries, with an explicit confirmation.
 */
import { z } from 'zod';
import { textField } from './fields';

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

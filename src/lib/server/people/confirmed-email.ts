/**
 * What needs a confirmed e-mail address: posting a job, booking, writing in a question thread and
 * sending an installer application. Routes send an unconfirmed user to the confirmation page
 * (`requireConfirmedRole` in guards.ts), which explains and offers a new link; the domain
 * functions check again here, so no other path gets round it.
 */
import { eq } from 'drizzle-orm';
import { db, type Tx } from '../db';
import { user } from '../db/schema';
import { refuse, type Refusal } from '../refusal';

/** The refusal's words; the confirmation page says the same at more length. */
export const EMAIL_NOT_CONFIRMED =
	'Confirm your e-mail address first: open the link we sent you, or ask for a new one on the confirmation page (/verify-email).';

/** A 403 refusal when the account has not confirmed its e-mail address, else null. */
export async function unconfirmedEmail(
	tx: Tx | typeof db,
	userId: string
): Promise<Refusal | null> {
	const [row] = await tx
		.select({ verifiedAt: user.emailVerifiedAt })
		.from(user)
		.where(eq(user.id, userId));
	return row?.verifiedAt ? null : refuse(403, EMAIL_NOT_CONFIRMED);
}

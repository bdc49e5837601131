/**
 * What happens to held funds when a paid booking is cancelled (Tapline's rules, as the payments
 * issue states them): the owner cancelling more than 48 hours before the slot gets everything
 * back; later, a late fee goes to the installer and the rest back to the owner; the installer
 * cancelling refunds the owner in full and opens the job to quotes again. Pure and tested.
 */
import { assertCents } from './money';

/** More than this before the slot starts, an owner cancels for free (Tapline's rule). */
export const FREE_CANCELLATION_HOURS = 48;

/** Tapline's starting late-cancellation fee paid to the installer: $50.00 (Tapline's choice). */
export const DEFAULT_LATE_FEE_CENTS = 5000;

export type CancelledBy = 'owner' | 'installer';

export interface CancellationInput {
	cancelledBy: CancelledBy;
	/** When the cancellation is made. */
	at: Date;
	slotStart: Date;
	/** What the booking holds now, per the ledger. */
	heldCents: number;
	/** The configured late fee; capped at what is held. */
	lateFeeCents: number;
}

export interface CancellationSettlement {
	refundCents: number;
	/** Paid to the installer from the held funds. */
	lateFeeCents: number;
	/** Whether the job collects quotes again. */
	reopenJob: boolean;
	/** The rule applied, in words for the owner. */
	rule: string;
}

/** Splits the held funds of a cancelled booking into a refund and a late fee. */
export function cancellationSettlement(input: CancellationInput): CancellationSettlement {
	assertCents(input.heldCents, 'heldCents');
	assertCents(input.lateFeeCents, 'lateFeeCents');
	if (input.heldCents < 0 || input.lateFeeCents < 0)
		throw new RangeError('amounts must not be negative');
	if (input.cancelledBy === 'installer') {
		return {
			refundCents: input.heldCents,
			lateFeeCents: 0,
			reopenJob: true,
			rule: 'The installer cancelled, so everything you paid comes back and your job is open for quotes again.'
		};
	}
	const hoursAhead = (input.slotStart.getTime() - input.at.getTime()) / 3_600_000;
	if (hoursAhead > FREE_CANCELLATION_HOURS) {
		return {
			refundCents: input.heldCents,
			lateFeeCents: 0,
			reopenJob: false,
			rule: `Cancelled more than ${FREE_CANCELLATION_HOURS} hours before the fit, so everything you paid comes back.`
		};
	}
	const fee = Math.min(input.lateFeeCents, input.heldCents);
	return {
		refundCents: input.heldCents - fee,
		lateFeeCents: fee,
		reopenJob: false,
		rule: `Cancelled ${FREE_CANCELLATION_HOURS} hours or less before the fit, so the late-cancellation fee goes to the installer for the time they kept free, and the rest comes back to you.`
	};
}

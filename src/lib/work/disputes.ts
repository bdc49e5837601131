/**
 * Disputes about reported work: the reasons an owner picks from (Tapline's own list) and what each
 * settlement an admin may choose does with the held funds. Pure; the server module applies the
 * result to the ledger and the payment provider in one transaction.
 */
import { releaseSplit, type FeeSettings, type ReleaseSplit } from '../money/fees';
import { formatAud } from '../money/money';

/** Why an owner raises a problem (Tapline's own list; words in labels.ts). */
export const DISPUTE_REASONS = [
	'not-recording',
	'parking-mode',
	'battery-drained',
	'cable-visible',
	'vehicle-damage',
	'not-as-quoted',
	'other'
] as const;
export type DisputeReason = (typeof DISPUTE_REASONS)[number];

/** How an admin may settle a dispute. */
export const SETTLEMENT_OUTCOMES = [
	'release',
	'partial_refund',
	'full_refund',
	'return_visit'
] as const;
export type SettlementOutcome = (typeof SETTLEMENT_OUTCOMES)[number];

/** What a settlement moves, in cents. */
export interface SettlementMoney {
	/** Back to the owner. */
	refundCents: number;
	/** Released towards the installer (before Tapline's fee); 0 when nothing is released. */
	releaseCents: number;
	/** Tapline's fee and the installer's payout on the released part; null when nothing is. */
	split: ReleaseSplit | null;
}

export type SettlementCheck = ({ ok: true } & SettlementMoney) | { ok: false; message: string };

/**
 * The money of a settlement from what the booking holds.
 * - release: everything held is released; Tapline's fee as on any release.
 * - partial_refund: `refundCents` (more than nothing, less than held) goes back to the owner and
 *   the rest is released, with Tapline's fee computed on that released remainder only (the fee is
 *   for the work paid for, not for the money returned).
 * - full_refund: everything held goes back to the owner; no fee.
 * - return_visit: nothing moves; the funds stay held for the new visit.
 */
export function settlementMoney(
	outcome: SettlementOutcome,
	heldCents: number,
	refundCents: number | null,
	fee: FeeSettings
): SettlementCheck {
	if (!Number.isSafeInteger(heldCents) || heldCents < 0) {
		throw new RangeError('heldCents must be whole cents, not negative');
	}
	if (outcome === 'return_visit') return { ok: true, refundCents: 0, releaseCents: 0, split: null };
	if (heldCents === 0) return { ok: false, message: 'This booking holds nothing to settle.' };
	switch (outcome) {
		case 'release':
			return {
				ok: true,
				refundCents: 0,
				releaseCents: heldCents,
				split: releaseSplit(heldCents, fee)
			};
		case 'full_refund':
			return { ok: true, refundCents: heldCents, releaseCents: 0, split: null };
		case 'partial_refund': {
			if (refundCents === null || !Number.isSafeInteger(refundCents) || refundCents <= 0) {
				return { ok: false, message: 'Enter the amount to refund: more than $0.00.' };
			}
			if (refundCents >= heldCents) {
				return {
					ok: false,
					message: `A partial refund must be less than the ${formatAud(heldCents)} held; for all of it choose a full refund.`
				};
			}
			const releaseCents = heldCents - refundCents;
			return { ok: true, refundCents, releaseCents, split: releaseSplit(releaseCents, fee) };
		}
	}
}

/**
 * Tapline's fee on a released booking, and the GST in it. The fee is a percentage of what the
 * owner paid, with a minimum, never more than the total; it is GST-inclusive, so the GST on it is
 * one eleventh of the fee (Australian Taxation Office: GST is 1/11 of a GST-inclusive price).
 * What the installer receives is the total less the fee. Pure: the server passes its settings in.
 */
import { assertCents, divideRoundHalfUp, gstFromInclusive } from './money';

/** How Tapline's fee is set: a percentage in basis points (1000 = 10 %) with a minimum. */
export interface FeeSettings {
	percentBasisPoints: number;
	minimumCents: number;
}

/** Tapline's starting fee: 10 % of the booking with a $15.00 minimum (Tapline's own choice). */
export const DEFAULT_FEE: FeeSettings = { percentBasisPoints: 1000, minimumCents: 1500 };

/** A release split into Tapline's fee (and its GST) and the installer's payout, in cents. */
export interface ReleaseSplit {
	totalCents: number;
	feeCents: number;
	gstOnFeeCents: number;
	payoutCents: number;
}

/**
 * Splits a held total into Tapline's fee and the installer's payout.
 * @param totalCents what the owner paid into held funds
 * @param settings the fee percentage and minimum
 */
export function releaseSplit(
	totalCents: number,
	settings: FeeSettings = DEFAULT_FEE
): ReleaseSplit {
	assertCents(totalCents, 'totalCents');
	assertCents(settings.minimumCents, 'minimumCents');
	if (totalCents <= 0) throw new RangeError('totalCents must be positive');
	if (!Number.isSafeInteger(settings.percentBasisPoints) || settings.percentBasisPoints < 0) {
		throw new RangeError('percentBasisPoints must be a whole number of basis points');
	}
	const byPercent = divideRoundHalfUp(totalCents * settings.percentBasisPoints, 10_000);
	const feeCents = Math.min(totalCents, Math.max(settings.minimumCents, byPercent));
	return {
		totalCents,
		feeCents,
		gstOnFeeCents: gstFromInclusive(feeCents),
		payoutCents: totalCents - feeCents
	};
}

/**
 * Reads fee settings from text (environment values), falling back to {@link DEFAULT_FEE} for a
 * missing or malformed value.
 */
export function feeSettingsFrom(
	percent: string | undefined,
	minimumCents: string | undefined
): FeeSettings {
	const p = percent === undefined ? NaN : Number(percent);
	const m = minimumCents === undefined ? NaN : Number(minimumCents);
	return {
		percentBasisPoints:
			Number.isFinite(p) && p >= 0 && p <= 100
				? Math.round(p * 100)
				: DEFAULT_FEE.percentBasisPoints,
		minimumCents: Number.isSafeInteger(m) && m >= 0 ? m : DEFAULT_FEE.minimumCents
	};
}

/** The fee rule in words, e.g. "10 % of the total, at least $15.00". */
export function feeRuleText(settings: FeeSettings): string {
	const percent = (settings.percentBasisPoints / 100).toLocaleString('en-AU', {
		maximumFractionDigits: 2
	});
	const minimum = (settings.minimumCents / 100).toLocaleString('en-AU', {
		style: 'currency',
		currency: 'AUD'
	});
	return `${percent} % of the total, at least ${minimum}`;
}

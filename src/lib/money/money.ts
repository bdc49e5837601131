/**
 * Money helpers. Every amount is an integer number of cents; anything else is rejected rather
 * than silently rounded, so a fractional cent can never sneak into a quote or a ledger row.
 *
 * Rounding rule (one rule for the whole product): half away from zero to the nearest cent,
 * which is "half up" for the positive amounts a price guide deals with.
 */

/** GST rate in basis points: 10 % (Australian Taxation Office, "GST" basics). */
export const GST_RATE_BASIS_POINTS = 1000;

const BASIS_POINTS_PER_UNIT = 10_000;

/**
 * Throws unless `cents` is a safe integer.
 * @param cents the amount to check
 * @param name what the amount is, for the error message
 */
export function assertCents(cents: number, name = 'cents'): void {
	if (!Number.isSafeInteger(cents)) {
		throw new RangeError(`${name} must be a whole number of cents, got ${String(cents)}`);
	}
}

/**
 * Divides two integers and rounds half away from zero, without floating-point drift.
 * @param numerator an integer
 * @param denominator a positive integer
 * @returns the rounded quotient
 */
export function divideRoundHalfUp(numerator: number, denominator: number): number {
	assertCents(numerator, 'numerator');
	if (!Number.isSafeInteger(denominator) || denominator <= 0) {
		throw new RangeError('denominator must be a positive integer');
	}
	const magnitude = Math.abs(numerator);
	// floor((2n + d) / 2d) is round-half-up for n >= 0, computed exactly on integers.
	const doubled = 2 * magnitude + denominator;
	if (!Number.isSafeInteger(doubled)) throw new RangeError('amount too large to round safely');
	const rounded = Math.floor(doubled / (2 * denominator));
	// Avoid -0, which would print as '-$0.00'.
	return numerator < 0 && rounded !== 0 ? -rounded : rounded;
}

/**
 * Multiplies cents by a rational factor and rounds half away from zero to whole cents.
 * Used for labour (rate per hour x minutes / 60) so the rounding rule lives in one place.
 * @param cents an integer amount
 * @param multiplier an integer
 * @param divisor a positive integer
 */
export function scaleCents(cents: number, multiplier: number, divisor: number): number {
	assertCents(cents);
	if (!Number.isSafeInteger(multiplier)) throw new RangeError('multiplier must be an integer');
	const product = cents * multiplier;
	if (!Number.isSafeInteger(product)) throw new RangeError('amount too large to scale safely');
	return divideRoundHalfUp(product, divisor);
}

/**
 * The GST contained in a GST-inclusive amount. At 10 % that is one eleventh of the price
 * (Australian Taxation Office guidance), rounded half up to the cent.
 * @param inclusiveCents the GST-inclusive amount in cents
 * @param rateBasisPoints the GST rate; 1000 = 10 %
 */
export function gstFromInclusive(
	inclusiveCents: number,
	rateBasisPoints: number = GST_RATE_BASIS_POINTS
): number {
	assertCents(inclusiveCents, 'inclusiveCents');
	assertRate(rateBasisPoints);
	// rate / (1 + rate) with the rate in basis points: bp / (10000 + bp); 1000 bp gives 1/11.
	return scaleCents(inclusiveCents, rateBasisPoints, BASIS_POINTS_PER_UNIT + rateBasisPoints);
}

/**
 * Adds GST to a GST-exclusive amount; the GST itself is rounded half up to the cent.
 * @param exclusiveCents the GST-exclusive amount in cents
 * @param rateBasisPoints the GST rate; 1000 = 10 %
 * @returns the GST-inclusive amount in cents
 */
export function addGst(
	exclusiveCents: number,
	rateBasisPoints: number = GST_RATE_BASIS_POINTS
): number {
	assertCents(exclusiveCents, 'exclusiveCents');
	assertRate(rateBasisPoints);
	return exclusiveCents + scaleCents(exclusiveCents, rateBasisPoints, BASIS_POINTS_PER_UNIT);
}

/**
 * Formats cents as Australian dollars, e.g. 123450 -> '$1,234.50', -5 -> '-$0.05'.
 * Done by hand rather than with Intl so the output is identical in every runtime.
 * @param cents an integer amount
 */
export function formatAud(cents: number): string {
	assertCents(cents);
	const magnitude = Math.abs(cents);
	const dollars = Math.floor(magnitude / 100);
	const remainder = magnitude % 100;
	const grouped = String(dollars).replace(/\B(?=(\d{3})+(?!\d))/g, ',');
	const sign = cents < 0 ? '-' : '';
	return `${sign}$${grouped}.${String(remainder).padStart(2, '0')}`;
}

function assertRate(rateBasisPoints: number): void {
	if (!Number.isSafeInteger(rateBasisPoints) || rateBasisPoints < 0) {
		throw new RangeError('GST rate must be a non-negative whole number of basis points');
	}
}

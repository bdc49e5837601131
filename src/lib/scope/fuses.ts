/**
 * Blade fuse ratings, colours and sizing for the fuse a tap adds.
 * Sources: ISO 8820-3 and makers' colour reference tables for ratings and colours; sizing rules
 * are common trade practice. Entries marked 'memory' are from memory and unverified.
 */

export type FuseFamily = 'standard' | 'mini' | 'low-profile-mini' | 'micro2' | 'micro3';

export type FactSource = 'published' | 'memory';

export interface FuseRating {
	amps: number;
	colour: string;
	source: FactSource;
}

/**
 * Ratings and colours shared by standard, mini and low-profile mini blades (ISO 8820-3 and
 * fuse colour reference tables agree for 1–20 A; 4, 25, 30, 35 and 40 A are from memory).
 */
export const BLADE_FUSE_RATINGS: readonly FuseRating[] = [
	{ amps: 1, colour: 'black', source: 'published' },
	{ amps: 2, colour: 'grey', source: 'published' },
	{ amps: 3, colour: 'violet', source: 'published' },
	{ amps: 4, colour: 'pink', source: 'memory' },
	{ amps: 5, colour: 'tan', source: 'published' },
	{ amps: 7.5, colour: 'brown', source: 'published' },
	{ amps: 10, colour: 'red', source: 'published' },
	{ amps: 15, colour: 'blue', source: 'published' },
	{ amps: 20, colour: 'yellow', source: 'published' },
	{ amps: 25, colour: 'natural', source: 'memory' },
	{ amps: 30, colour: 'green', source: 'memory' },
	{ amps: 35, colour: 'blue-green', source: 'memory' },
	{ amps: 40, colour: 'orange', source: 'memory' }
];

export interface FuseFamilyRange {
	minAmps: number;
	maxAmps: number;
	source: FactSource;
}

/** Ratings each family is made in (all from memory; micro2 5–30 A and micro3 5–15 A). */
export const FUSE_FAMILY_RANGES: Readonly<Record<FuseFamily, FuseFamilyRange>> = {
	standard: { minAmps: 1, maxAmps: 40, source: 'memory' },
	mini: { minAmps: 2, maxAmps: 30, source: 'memory' },
	'low-profile-mini': { minAmps: 2, maxAmps: 30, source: 'memory' },
	micro2: { minAmps: 5, maxAmps: 30, source: 'memory' },
	micro3: { minAmps: 5, maxAmps: 15, source: 'memory' }
};

/** Trade-practice sizing for a dash-cam lead: 1.25 x steady draw, typically 2–5 A. */
export const ACCESSORY_FUSE_HEADROOM = 1.25;
export const ACCESSORY_FUSE_MIN_AMPS = 2;
export const ACCESSORY_FUSE_TYPICAL_MAX_AMPS = 5;

// Guards against 1.25 x 4 landing a hair above 5 in binary floating point.
const EPSILON = 1e-9;

/**
 * The colour of a blade fuse rating, or undefined when the rating is not a standard one.
 * @param amps the rating, e.g. 7.5
 */
export function fuseColour(amps: number): string | undefined {
	return BLADE_FUSE_RATINGS.find((rating) => rating.amps === amps)?.colour;
}

/**
 * The smallest standard rating of a family at or above `amps`, or undefined when the family
 * has nothing that large.
 * @param amps the minimum rating needed
 * @param family the fuse family the slot takes
 */
export function nextStandardRating(
	amps: number,
	family: FuseFamily = 'standard'
): number | undefined {
	if (!Number.isFinite(amps) || amps < 0)
		throw new RangeError('amps must be a non-negative number');
	const range = FUSE_FAMILY_RANGES[family];
	return BLADE_FUSE_RATINGS.find(
		(rating) =>
			rating.amps >= range.minAmps && rating.amps <= range.maxAmps && rating.amps >= amps - EPSILON
	)?.amps;
}

export interface AccessoryFuse {
	/** The rating to fit, or undefined when no rating fits this slot. */
	amps: number | undefined;
	colour: string | undefined;
	/** False when the slot cannot carry this accessory; pick another slot. */
	suitable: boolean;
	notes: string[];
}

/**
 * Sizes the fuse for the tap's added slot (common trade practice): at least 1.25 x the steady
 * draw, rounded up to the next standard rating, at least 2 A, and never above the fuse of the
 * circuit being tapped. For any realistic dash-cam draw that lands on 2–5 A.
 * @param drawAmps the accessory's steady draw at 12 V, in amps
 * @param originalFuseAmps the rating of the fuse already in the slot, when known
 * @param family the fuse family of the tap
 */
export function fuseForAccessory(
	drawAmps: number,
	originalFuseAmps?: number,
	family: FuseFamily = 'standard'
): AccessoryFuse {
	if (!Number.isFinite(drawAmps) || drawAmps <= 0) {
		throw new RangeError('drawAmps must be a positive number');
	}
	const notes: string[] = [];
	const needed = drawAmps * ACCESSORY_FUSE_HEADROOM;
	let amps = nextStandardRating(Math.max(needed, ACCESSORY_FUSE_MIN_AMPS), family);
	if (amps !== undefined && originalFuseAmps !== undefined && amps > originalFuseAmps) {
		// The 2 A floor gives way to the cap: a smaller fuse that still covers the draw is fine.
		amps = nextStandardRating(needed, family);
		if (amps !== undefined && amps > originalFuseAmps) amps = undefined;
		if (amps === undefined) {
			notes.push(
				`The slot's own fuse (${originalFuseAmps} A) is smaller than this lead needs; use another slot.`
			);
		}
	}
	if (amps === undefined) {
		if (notes.length === 0) notes.push('No fuse of this family is large enough; check the draw.');
		return { amps: undefined, colour: undefined, suitable: false, notes };
	}
	if (amps > ACCESSORY_FUSE_TYPICAL_MAX_AMPS) {
		notes.push(
			`${amps} A is above the 2–5 A usual for a dash camera; check the draw before fitting it.`
		);
	}
	return { amps, colour: fuseColour(amps), suitable: true, notes };
}

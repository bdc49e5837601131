/**
 * Labour calibration: the scope sheet's default labour range (common trade practice, see
 * $lib/scope/labour) moved toward what Tapline installers actually reported for similar jobs
 * (same body style, cameras and power method). Pure: no I/O.
 *
 * The statistic, and why:
 * - The **median** of the reported minutes, not the mean: one very slow fit (a seized trim clip,
 *   a car that took an hour to go to sleep) moves a mean a long way and a median hardly at all.
 * - **Shrinkage** toward the default's middle with weight w = n / (n + K), K = {@link SHRINKAGE_K}:
 *   the median of a handful of fits still says more about those installers and cars than about the
 *   next job, so a couple of fits only nudge the estimate; with K = 5, five fits count as much as
 *   the trade's range, twenty fits carry 80 % of the weight. K is Tapline's choice (our estimate),
 *   the usual "prior worth a few observations" of a shrinkage estimator.
 * - Below {@link MIN_FITS} fits the default is kept as it is: a median of one or two numbers is
 *   just those fits.
 * The calibrated range keeps the default's width and moves its middle; it is rounded to 5 minutes
 * (the sheet is a guide, not a stopwatch) and never starts below {@link MIN_LABOUR_MINUTES}.
 */

/** Shrinkage strength: the default counts as this many fits (Tapline's choice, see above). */
export const SHRINKAGE_K = 5;

/** Fewer reported fits than this keep the default unchanged (Tapline's choice, see above). */
export const MIN_FITS = 3;

/** The shortest labour a calibrated range may start from, in minutes (a plug-in front camera). */
export const MIN_LABOUR_MINUTES = 15;

/** The labour range a scope sheet starts from, in minutes. */
export interface LabourRange {
	minMinutes: number;
	maxMinutes: number;
}

/** What calibration did, kept on the scope sheet so it can say "based on N fits". */
export interface LabourCalibration {
	/** Reported fits of similar jobs that were used. */
	fits: number;
	/** Their median, in minutes. */
	medianMinutes: number;
	/** The weight the median got (n / (n + K)). */
	weight: number;
	/** The default range before calibration. */
	defaultMinMinutes: number;
	defaultMaxMinutes: number;
}

export interface CalibratedLabour extends LabourRange {
	/** Null when the default was kept (too few fits). */
	calibration: LabourCalibration | null;
}

/** The median of a list of numbers (the mean of the middle two for an even count); null when empty. */
export function median(values: readonly number[]): number | null {
	if (values.length === 0) return null;
	const sorted = [...values].sort((a, b) => a - b);
	const mid = Math.floor(sorted.length / 2);
	return sorted.length % 2 === 1 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

const roundTo5 = (minutes: number) => Math.round(minutes / 5) * 5;

/**
 * The labour range calibrated by the minutes reported on similar fits.
 * @param range the scope's default labour range, minutes
 * @param fitMinutes minutes taken on similar fits (positive whole minutes; others are ignored)
 */
export function calibrateLabour(
	range: LabourRange,
	fitMinutes: readonly number[]
): CalibratedLabour {
	const usable = fitMinutes.filter((m) => Number.isFinite(m) && m > 0);
	const n = usable.length;
	const med = median(usable);
	if (n < MIN_FITS || med === null) {
		return { minMinutes: range.minMinutes, maxMinutes: range.maxMinutes, calibration: null };
	}
	const weight = n / (n + SHRINKAGE_K);
	const defaultMiddle = (range.minMinutes + range.maxMinutes) / 2;
	const middle = weight * med + (1 - weight) * defaultMiddle;
	const halfWidth = (range.maxMinutes - range.minMinutes) / 2;
	const minMinutes = Math.max(MIN_LABOUR_MINUTES, roundTo5(middle - halfWidth));
	const maxMinutes = Math.max(minMinutes, roundTo5(middle + halfWidth));
	return {
		minMinutes,
		maxMinutes,
		calibration: {
			fits: n,
			medianMinutes: med,
			weight,
			defaultMinMinutes: range.minMinutes,
			defaultMaxMinutes: range.maxMinutes
		}
	};
}

/** "based on 1 fit" / "based on 7 fits". */
export const basedOnFits = (fits: number) => `based on ${String(fits)} fit${fits === 1 ? '' : 's'}`;

// Worked examples of the labour calibration. Sources: the default ranges are common trade practice
// ($lib/scope/labour); K = 5 and the minimum of 3 fits are Tapline's choices, explained in
// calibration.ts; the arithmetic below is done by hand.
import { describe, expect, it } from 'vitest';
import { basedOnFits, calibrateLabour, median, MIN_FITS, SHRINKAGE_K } from './calibration';
import { estimateLabour } from '../scope/labour';

// Front and rear through a tailgate, hard-wired with parking mode: 110–210 min, middle 160.
const HATCH = { minMinutes: 110, maxMinutes: 210 };

describe('median', () => {
	it('takes the middle value, or the mean of the middle two', () => {
		expect(median([])).toBeNull();
		expect(median([7])).toBe(7);
		expect(median([400, 120, 140])).toBe(140);
		expect(median([100, 120, 140, 160])).toBe(130);
	});
});

describe('calibrateLabour', () => {
	it('matches the hatchback default it is meant for (common trade practice)', () => {
		const est = estimateLabour({
			bodyStyle: 'hatchback',
			cameras: 'front-rear',
			power: 'hardwired-parking',
			removeOldUnit: false
		});
		expect({ minMinutes: est.minMinutes, maxMinutes: est.maxMinutes }).toEqual(HATCH);
	});

	it('keeps the default when data is thin (fewer than 3 fits)', () => {
		expect(MIN_FITS).toBe(3);
		expect(calibrateLabour(HATCH, [])).toEqual({ ...HATCH, calibration: null });
		// Two quick fits are not enough to move the guide.
		expect(calibrateLabour(HATCH, [60, 70])).toEqual({ ...HATCH, calibration: null });
	});

	it('five fits with one very slow one: the median ignores it, shrinkage halves the move', () => {
		// Hand-worked: median of 120, 130, 140, 150, 400 is 140 (the mean would be 188).
		// w = 5 / (5 + 5) = 0.5; middle = 0.5 × 140 + 0.5 × 160 = 150; shift −10 → 100–200.
		expect(SHRINKAGE_K).toBe(5);
		const out = calibrateLabour(HATCH, [120, 400, 130, 150, 140]);
		expect(out.minMinutes).toBe(100);
		expect(out.maxMinutes).toBe(200);
		expect(out.calibration).toEqual({
			fits: 5,
			medianMinutes: 140,
			weight: 0.5,
			defaultMinMinutes: 110,
			defaultMaxMinutes: 210
		});
	});

	it('three fits barely move it (weight 3/8)', () => {
		// Median 100; middle = 3/8 × 100 + 5/8 × 160 = 137.5; 137.5 ± 50 = 87.5–187.5 → 90–190
		// after rounding to 5 minutes (Math.round(17.5) = 18 → 90, Math.round(37.5) = 38 → 190).
		const out = calibrateLabour(HATCH, [100, 90, 110]);
		expect(out.calibration?.weight).toBeCloseTo(0.375, 10);
		expect([out.minMinutes, out.maxMinutes]).toEqual([90, 190]);
	});

	it('twenty fits carry 80 % of the weight', () => {
		// Median 220; w = 20/25 = 0.8; middle = 176 + 32 = 208; 208 ± 50 = 158–258 → 160–260.
		const fits = Array.from({ length: 20 }, (_, i) => (i < 10 ? 210 : 230));
		const out = calibrateLabour(HATCH, fits);
		expect(out.calibration?.weight).toBeCloseTo(0.8, 10);
		expect([out.minMinutes, out.maxMinutes]).toEqual([160, 260]);
	});

	it('never starts below 15 minutes and ignores impossible times', () => {
		// Front plug-in 15–30 (middle 22.5); fits of 5 min: median 5, w = 10/15;
		// middle = 2/3 × 5 + 1/3 × 22.5 = 10.83; 10.83 ± 7.5 → 3.3–18.3 → min held at 15, max 20.
		const out = calibrateLabour({ minMinutes: 15, maxMinutes: 30 }, [
			...Array.from({ length: 10 }, () => 5),
			0,
			-3,
			Number.NaN
		]);
		expect(out.calibration?.fits).toBe(10);
		expect([out.minMinutes, out.maxMinutes]).toEqual([15, 20]);
	});

	it('says how many fits it rests on', () => {
		expect(basedOnFits(1)).toBe('based on 1 fit');
		expect(basedOnFits(7)).toBe('based on 7 fits');
	});
});

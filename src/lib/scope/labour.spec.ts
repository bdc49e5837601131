import { describe, expect, it } from 'vitest';
import { estimateLabour, type LabourInput } from './labour';

const base: LabourInput = {
	bodyStyle: 'hatchback',
	cameras: 'front',
	power: 'hardwired-switched',
	removeOldUnit: false
};

function range(input: Partial<LabourInput>): [number, number] {
	const estimate = estimateLabour({ ...base, ...input });
	return [estimate.minMinutes, estimate.maxMinutes];
}

function codes(input: Partial<LabourInput>): string[] {
	return estimateLabour({ ...base, ...input }).lines.map((line) => line.code);
}

describe('estimateLabour totals', () => {
	it('front only', () => {
		// Source: common trade practice — front plug-in 15–30 min, front hard-wired 30–60 min.
		expect(range({ power: 'socket' })).toEqual([15, 30]);
		expect(range({ power: 'hardwired-switched' })).toEqual([30, 60]);
	});

	it('front + rear by body style', () => {
		// Source: common trade practice — front + rear sedan 60–120 min.
		expect(range({ bodyStyle: 'sedan', cameras: 'front-rear' })).toEqual([60, 120]);
		// Source: common trade practice — through a tailgate grommet (hatch, wagon, SUV) 90–150 min.
		for (const bodyStyle of ['hatchback', 'wagon', 'suv', 'people-mover'] as const) {
			expect(range({ bodyStyle, cameras: 'front-rear' })).toEqual([90, 150]);
		}
		// Source: common trade practice — vans and utes 2–4 h.
		expect(range({ bodyStyle: 'ute', cameras: 'front-rear' })).toEqual([120, 240]);
		expect(range({ bodyStyle: 'van', cameras: 'front-rear' })).toEqual([120, 240]);
	});

	it('adds the cabin camera, battery pack and old-unit removal', () => {
		// Source: common trade practice — cabin camera +15–30 min.
		expect(range({ bodyStyle: 'sedan', cameras: 'front-rear-cabin' })).toEqual([75, 150]);
		// Source: common trade practice — battery pack +30–60 min on a plug-in fit (15–30).
		expect(range({ power: 'battery-pack' })).toEqual([45, 90]);
		// Source: common trade practice — removing an old unit +30–60 min.
		expect(range({ removeOldUnit: true })).toEqual([60, 120]);
	});

	it('adds a parking-mode test for always-on power', () => {
		// Source: common trade practice — a permanent supply is tested with the car locked and
		// asleep, and cars take from minutes to about an hour to sleep; the 20–60 min allowance
		// (part of the wait overlaps tidying up) is our estimate. 30–60 + 20–60 = 50–120.
		expect(range({ power: 'hardwired-parking' })).toEqual([50, 120]);
		const test = estimateLabour({ ...base, power: 'hardwired-parking' }).lines.at(-1);
		expect(test?.label).toContain('up to an hour to sleep');
		expect(codes({ power: 'obd' })).toEqual(['front-camera', 'power-obd', 'parking-mode-test']);
	});
});

describe('estimateLabour lines', () => {
	it('routes the rear cable by body style', () => {
		// Source: common trade practice — tailgate grommet for hatch/wagon/SUV, parcel shelf and
		// C-pillar for a sedan.
		expect(codes({ bodyStyle: 'wagon', cameras: 'front-rear' })).toContain('rear-tailgate');
		expect(codes({ bodyStyle: 'sedan', cameras: 'front-rear' })).toContain('rear-sedan');
		expect(codes({ bodyStyle: 'sedan', cameras: 'front-rear' })).not.toContain('rear-tailgate');
		expect(codes({ bodyStyle: 'van', cameras: 'front-rear' })).toContain('long-body-allowance');
		expect(codes({ bodyStyle: 'van', cameras: 'front' })).not.toContain('long-body-allowance');
	});

	it('gives every line a sane range and a label', () => {
		// Source: arithmetic — a minimum never exceeds its maximum.
		const estimate = estimateLabour({
			bodyStyle: 'van',
			cameras: 'front-rear-cabin',
			power: 'hardwired-parking',
			removeOldUnit: true
		});
		for (const line of estimate.lines) {
			expect(line.minMinutes).toBeLessThanOrEqual(line.maxMinutes);
			expect(line.label.length).toBeGreaterThan(0);
		}
		expect(estimate.minMinutes).toBe(estimate.lines.reduce((s, l) => s + l.minMinutes, 0));
	});
});

import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { computeScope } from './index';
import { BATTERY_TYPES, BODY_STYLES, FUSE_FAMILY_ANSWERS, jobRequestSchema } from './request';
import {
	computeEstimate,
	ESTIMATE_CAMERAS,
	estimateSchema,
	estimateToJobRequest,
	type EstimateAnswers
} from './estimate';

const answersArb: fc.Arbitrary<EstimateAnswers> = fc.record({
	bodyStyle: fc.constantFrom(...BODY_STYLES),
	fuseFamily: fc.constantFrom(...FUSE_FAMILY_ANSWERS),
	batteryType: fc.constantFrom(...BATTERY_TYPES),
	batteryAh: fc.option(fc.integer({ min: 20, max: 200 }), { nil: undefined }),
	startStop: fc.boolean(),
	cameras: fc.constantFrom(...ESTIMATE_CAMERAS),
	parkingMode: fc.boolean(),
	suburb: fc.constantFrom('Norwood', '5067', 'Glenelg'),
	restVolts: fc.option(fc.double({ min: 10.5, max: 13.5, noNaN: true }), { nil: undefined }),
	cutOffVolts: fc.option(fc.double({ min: 11.6, max: 12.5, noNaN: true }), { nil: undefined }),
	parkingDrawMilliamps: fc.option(fc.integer({ min: 5, max: 2000 }), { nil: undefined })
});

const carArb = fc.record({
	make: fc.constantFrom('Demo Motors', 'Sample Auto'),
	model: fc.constantFrom('Estate', 'Runabout'),
	year: fc.integer({ min: 1990, max: 2030 }).map(String)
});

describe('computeEstimate', () => {
	it('equals the scope sheet and battery budget a posted job with the same answers gets', () => {
		fc.assert(
			fc.property(answersArb, carArb, (answers, car) => {
				expect(estimateSchema.parse(answers)).toEqual(answers);
				// A posted job goes through the job form's own schema with the owner's real car.
				const posted = computeScope(jobRequestSchema.parse(estimateToJobRequest(answers, car)));
				expect(computeEstimate(answers)).toEqual(posted);
			})
		);
	});

	it('gives parked hours only when parking mode is chosen', () => {
		const base = estimateSchema.parse({
			bodyStyle: 'wagon',
			fuseFamily: 'unknown',
			batteryType: 'flooded',
			batteryAh: 60,
			cameras: 'front-rear',
			suburb: 'Norwood'
		});
		expect(computeEstimate(base).parking).toBeNull();
		const parked = computeEstimate({ ...base, parkingMode: true }).parking;
		expect(parked?.budget.estimated).toBe(true);
		expect(computeEstimate(base).rearCable).not.toBeNull();
	});
});

describe('estimateSchema refuses bad input with a clear message', () => {
	const valid = {
		bodyStyle: 'sedan',
		fuseFamily: 'mini',
		batteryType: 'agm',
		cameras: 'front',
		suburb: 'Norwood'
	};
	const messageFor = (patch: Record<string, unknown>) => {
		const result = estimateSchema.safeParse({ ...valid, ...patch });
		expect(result.success).toBe(false);
		return result.error?.issues[0]?.message;
	};

	it('a battery of 0 Ah or 1e308 Ah', () => {
		expect(messageFor({ batteryAh: 0 })).toBe('Battery capacity is usually between 20 and 200 Ah');
		// 1e308 is not a safe integer, so the job form's whole-number check answers first.
		expect(messageFor({ batteryAh: 1e308 })).toBe('Enter the battery capacity in whole amp-hours');
	});

	it('a NUL byte or an empty suburb', () => {
		expect(messageFor({ suburb: 'Nor\u0000wood' })).toBe(
			'Enter the suburb in plain letters and digits'
		);
		expect(messageFor({ suburb: '  ' })).toBe('Enter your suburb or postcode');
	});

	it('a camera setup the estimate does not offer', () => {
		expect(messageFor({ cameras: 'front-rear-cabin' })).toBe(
			'Choose front only, or front and rear'
		);
	});
});

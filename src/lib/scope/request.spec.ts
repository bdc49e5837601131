import { describe, expect, it } from 'vitest';
import { jobRequestSchema, type JobRequestFormData } from './request';

// Invented demo vehicle; no real make or model.
const VALID: JobRequestFormData = {
	make: 'Demo Motors',
	model: 'Runabout',
	year: '2019',
	bodyStyle: 'hatchback',
	fuseFamily: 'mini',
	batteryType: 'flooded',
	curtainAirbags: 'yes',
	cameras: 'front-rear',
	cameraSupply: 'owner',
	power: 'hardwired-parking'
};

function fieldErrors(data: unknown): Record<string, string[]> {
	const result = jobRequestSchema.safeParse(data);
	if (result.success) return {};
	const errors: Record<string, string[]> = {};
	for (const issue of result.error.issues) {
		const key = issue.path.join('.');
		(errors[key] ??= []).push(issue.message);
	}
	return errors;
}

describe('jobRequestSchema', () => {
	it('accepts a complete request and fills the yes/no defaults', () => {
		// Source: the form contract — unticked checkboxes mean "no".
		const parsed = jobRequestSchema.parse({ ...VALID, make: '  Demo Motors  ' });
		expect(parsed.make).toBe('Demo Motors');
		expect(parsed.startStop).toBe(false);
		expect(parsed.hybridOrEv).toBe(false);
		expect(parsed.removeOldUnit).toBe(false);
		expect(parsed.cutOffVolts).toBeUndefined();
	});

	it('asks for a body style in words', () => {
		// Source: the form contract — human messages, not zod defaults.
		expect(fieldErrors({ ...VALID, bodyStyle: undefined }).bodyStyle).toEqual([
			'Choose a body style'
		]);
		expect(fieldErrors({ ...VALID, bodyStyle: 'limousine' }).bodyStyle).toEqual([
			'Choose a body style'
		]);
	});

	it('names each missing choice', () => {
		// Source: the form contract.
		const errors = fieldErrors({ make: '', model: 'X', year: '2019' });
		expect(errors.make).toEqual(['Enter the make']);
		expect(errors.cameras).toEqual(['Choose which cameras to fit']);
		expect(errors.power).toEqual(['Choose how the camera is powered']);
		expect(errors.cameraSupply).toEqual(['Say who supplies the camera']);
	});

	it('wants a four-digit year', () => {
		// Source: the form contract.
		expect(fieldErrors({ ...VALID, year: '19' }).year).toEqual([
			'Enter a year from 1900 to 2099, e.g. 2018'
		]);
	});

	it('needs a budget when the installer supplies the camera', () => {
		// Source: the form contract.
		expect(fieldErrors({ ...VALID, cameraSupply: 'installer' }).cameraBudgetCents).toEqual([
			'Enter a budget for the camera the installer supplies'
		]);
		expect(fieldErrors({ ...VALID, cameraSupply: 'installer', cameraBudgetCents: 25_000 })).toEqual(
			{}
		);
		expect(
			fieldErrors({ ...VALID, cameraSupply: 'installer', cameraBudgetCents: 250.5 })
				.cameraBudgetCents
		).toEqual(['Enter the budget in whole cents']);
	});

	it('keeps the cut-off within what kits offer', () => {
		// Source: hard-wire kit listings (published) — cut-off choices 11.6–12.5 V.
		expect(fieldErrors({ ...VALID, cutOffVolts: 11.6 })).toEqual({});
		expect(fieldErrors({ ...VALID, cutOffVolts: 12.5 })).toEqual({});
		expect(fieldErrors({ ...VALID, cutOffVolts: 13 }).cutOffVolts).toEqual([
			'Choose a cut-off between 11.6 V and 12.5 V'
		]);
		expect(fieldErrors({ ...VALID, cutOffVolts: 11 }).cutOffVolts).toHaveLength(1);
	});

	it('rejects an implausible battery capacity', () => {
		// Source: common trade practice — car starter batteries sit well within 20–200 Ah.
		expect(fieldErrors({ ...VALID, batteryAh: 5 }).batteryAh).toEqual([
			'Battery capacity is usually between 20 and 200 Ah'
		]);
		expect(fieldErrors({ ...VALID, batteryAh: 60 })).toEqual({});
	});
});

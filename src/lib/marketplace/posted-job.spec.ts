import { describe, expect, it } from 'vitest';
import { SAMPLE_REQUEST } from '../../../seed/sample-request';
import { jobTitle, postedJobColumns, UNTITLED_JOB } from './posted-job';
import { computeScope } from '../scope';

describe('posted job columns', () => {
	it('titles a job by year, make and model, or calls it untitled', () => {
		expect(jobTitle(SAMPLE_REQUEST)).toBe('2018 Demo Hatch');
		expect(jobTitle({ make: 'Demo', model: ' ' })).toBe('Demo');
		expect(jobTitle({})).toBe(UNTITLED_JOB);
		expect(jobTitle(null)).toBe(UNTITLED_JOB);
	});

	it('stores the scope sheet and the price guide the sheet computes', () => {
		const columns = postedJobColumns(SAMPLE_REQUEST);
		const scope = computeScope(SAMPLE_REQUEST);
		expect(columns.scope).toEqual(scope);
		expect(columns.priceLowCents).toBe(scope.price.totalIncGst.min);
		expect(columns.priceHighCents).toBe(scope.price.totalIncGst.max);
		expect(columns.priceLowCents).toBeLessThanOrEqual(columns.priceHighCents);
		expect(columns).toMatchObject({
			bodyStyle: 'hatchback',
			cameras: 'front-rear',
			power: 'hardwired-parking'
		});
	});
});

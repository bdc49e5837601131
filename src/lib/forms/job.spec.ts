import { describe, expect, it } from 'vitest';
import {
	camerasStepSchema,
	nextStep,
	placeStepSchema,
	powerStepSchema,
	preferredDateProblem,
	vehicleStepSchema,
	withdrawSchema
} from './job';
import { SAMPLE_REQUEST } from '../../../seed/sample-request';

const messages = (r: {
	success: boolean;
	error?: { issues: { path: PropertyKey[]; message: string }[] };
}) => Object.fromEntries((r.error?.issues ?? []).map((i) => [String(i.path[0]), i.message]));

// The vehicle step's answers of the shared sample request (other fields are not the step's).
const vehicle = { ...SAMPLE_REQUEST };

describe('job request steps', () => {
	it('walks the steps in order and stays on review at the end', () => {
		expect(nextStep('vehicle')).toBe('cameras');
		expect(nextStep('place')).toBe('photos');
		expect(nextStep('review')).toBe('review');
	});

	it('vehicle: each bad field gets its own plain message', () => {
		expect(vehicleStepSchema.safeParse(vehicle).success).toBe(true);
		const bad = vehicleStepSchema.safeParse({
			...vehicle,
			make: '',
			year: '18',
			bodyStyle: 'limousine',
			fuseFamily: undefined,
			batteryAh: 900
		});
		expect(messages(bad)).toMatchObject({
			make: 'Enter the make',
			year: 'Enter a year from 1900 to 2099, e.g. 2018',
			bodyStyle: 'Choose a body style',
			fuseFamily: "Choose the fuse type, or 'not sure'",
			batteryAh: 'Battery capacity is usually between 20 and 200 Ah'
		});
	});

	it('cameras: a supplied camera needs a budget within sensible bounds', () => {
		const base = { cameras: 'front-rear', cameraSupply: 'installer', removeOldUnit: false };
		expect(messages(camerasStepSchema.safeParse(base))).toEqual({
			cameraBudgetDollars: 'Enter a budget for the camera the installer supplies'
		});
		expect(messages(camerasStepSchema.safeParse({ ...base, cameraBudgetDollars: 20 }))).toEqual({
			cameraBudgetDollars: 'A camera budget starts at $50'
		});
		expect(camerasStepSchema.safeParse({ ...base, cameraSupply: 'owner' }).success).toBe(true);
	});

	it('power: cut-off outside what kits offer is refused', () => {
		// Kits offer 11.6–12.5 V (published: kit listings, TRADE.md).
		expect(
			messages(powerStepSchema.safeParse({ power: 'hardwired-parking', cutOffVolts: 10.5 }))
		).toEqual({
			cutOffVolts: 'Choose a cut-off between 11.6 V and 12.5 V'
		});
		expect(
			powerStepSchema.safeParse({ power: 'hardwired-parking', cutOffVolts: 12.2 }).success
		).toBe(true);
	});

	it('place: needs a suburb, a date, and for a mobile fit a street address', () => {
		const bad = placeStepSchema.safeParse({ locationMode: 'mobile', place: 'x', date1: '' });
		expect(messages(bad)).toMatchObject({ place: 'Enter your suburb or postcode' });
		const noDate = placeStepSchema.safeParse({ locationMode: 'workshop', place: 'Norwood' });
		expect(messages(noDate)).toEqual({ date1: 'Choose at least one date that suits you' });
		const noAddress = placeStepSchema.safeParse({
			locationMode: 'mobile',
			place: 'Norwood',
			date2: '2026-12-10'
		});
		expect(messages(noAddress)).toEqual({
			addressLine:
				'For a fit at your place, enter the street address (installers see it only once booked)'
		});
	});

	it('withdraw: asks for a reason and an explicit confirmation', () => {
		expect(messages(withdrawSchema.safeParse({ reason: 'no', confirm: false }))).toEqual({
			reason: 'Tell installers why, in a few words (at least 5 characters)',
			confirm: 'Tick the box to confirm: this cannot be undone'
		});
	});
});

describe('preferredDateProblem', () => {
	it('accepts tomorrow up to 90 days ahead, in local calendar days', () => {
		expect(preferredDateProblem('2026-12-03', '2026-12-02')).toBeNull();
		expect(preferredDateProblem('2026-12-02', '2026-12-02')).toBe('Choose a date after today');
		// 2 Dec 2026 + 90 days = 2 Mar 2027 (31 Dec, 31 Jan, 28 Feb: 29 + 31 + 28 + 2 = 90), worked by hand.
		expect(preferredDateProblem('2027-03-02', '2026-12-02')).toBeNull();
		expect(preferredDateProblem('2027-03-03', '2026-12-02')).toBe('Choose a date within 90 days');
		// Across the April 2027 daylight-saving change the count is still whole days (IANA tz: Australia/Adelaide).
		expect(preferredDateProblem('2027-04-05', '2027-04-03')).toBeNull();
		expect(preferredDateProblem('not-a-date', '2026-12-02')).toBe('Choose a real date');
	});
});

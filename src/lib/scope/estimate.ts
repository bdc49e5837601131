/**
 * The public estimate: the few answers an owner gives before having an account, and the mapping
 * that turns them into the same job request a posted job gets, so the estimate and the posted
 * job's scope sheet come from one function (`computeScope`).
 */
import { z } from 'zod';
import { computeScope, type ScopeSheet } from './index';
import { jobRequestSchema, type JobRequestInput } from './request';

/** The camera setups the estimate asks about: front only, or front and rear. */
export const ESTIMATE_CAMERAS = ['front', 'front-rear'] as const;

const shape = jobRequestSchema.shape;

/** Suburb or postcode as typed; printable characters only (a NUL byte or control character is refused). */
const suburbField = z
	.string({ error: 'Enter your suburb or postcode' })
	.trim()
	.min(1, { error: 'Enter your suburb or postcode' })
	.max(60, { error: 'Keep the suburb under 60 characters' })
	// eslint-disable-next-line no-control-regex
	.regex(/^[^\u0000-\u001f\u007f]*$/, { error: 'Enter the suburb in plain letters and digits' });

export const estimateSchema = z.object({
	bodyStyle: shape.bodyStyle,
	fuseFamily: shape.fuseFamily,
	batteryType: shape.batteryType,
	batteryAh: shape.batteryAh,
	startStop: shape.startStop,
	cameras: z.enum(ESTIMATE_CAMERAS, { error: 'Choose front only, or front and rear' }),
	parkingMode: z.boolean({ error: 'Say whether you want parking mode' }).default(false),
	suburb: suburbField,
	restVolts: shape.restVolts,
	cutOffVolts: shape.cutOffVolts,
	parkingDrawMilliamps: shape.parkingDrawMilliamps
});

export type EstimateAnswers = z.output<typeof estimateSchema>;

/** The car details a draft asks for that the estimate does not; the estimate's scope ignores them. */
export interface CarDetails {
	make: string;
	model: string;
	year: string;
}

/**
 * The job request a posted job with these answers gets. Answers the estimate does not ask take
 * the job form's own "not sure" or default values.
 */
export function estimateToJobRequest(answers: EstimateAnswers, car: CarDetails): JobRequestInput {
	return jobRequestSchema.parse({
		...car,
		bodyStyle: answers.bodyStyle,
		fuseFamily: answers.fuseFamily,
		batteryType: answers.batteryType,
		batteryAh: answers.batteryAh,
		startStop: answers.startStop,
		curtainAirbags: 'unknown',
		cameras: answers.cameras,
		cameraSupply: 'owner',
		power: answers.parkingMode ? 'hardwired-parking' : 'hardwired-switched',
		restVolts: answers.restVolts,
		cutOffVolts: answers.cutOffVolts,
		parkingDrawMilliamps: answers.parkingDrawMilliamps
	});
}

/** Placeholder car for the estimate only; a draft asks for the real one. */
const ESTIMATE_CAR: CarDetails = { make: 'Your car', model: 'Your car', year: '2020' };

/** The scope sheet (with parked hours, cautions and price guide) for an owner's estimate answers. */
export function computeEstimate(answers: EstimateAnswers): ScopeSheet {
	return computeScope(estimateToJobRequest(answers, ESTIMATE_CAR));
}

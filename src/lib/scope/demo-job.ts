/**
 * An invented demo job for the scope tests (no real make or model): a wagon with a 60 Ah flooded
 * battery, curtain airbags, front and rear cameras and hard-wired parking mode.
 */
import { jobRequestSchema, type JobRequestInput } from './request';

export const DEMO_WAGON_JOB: JobRequestInput = jobRequestSchema.parse({
	make: 'Demo Motors',
	model: 'Estate',
	year: '2020',
	bodyStyle: 'wagon',
	fuseFamily: 'low-profile-mini',
	batteryType: 'flooded',
	batteryAh: 60,
	curtainAirbags: 'yes',
	cameras: 'front-rear',
	cameraSupply: 'owner',
	power: 'hardwired-parking'
});

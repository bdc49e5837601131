/**
 * The sample job request shared by the demo seed, the benchmark and the tests: an invented car
 * ('Demo' make), front and rear cameras, hard-wired with parking mode.
 */
import type { JobRequestInput } from '../src/lib/scope';

export const SAMPLE_REQUEST: JobRequestInput = {
	make: 'Demo',
	model: 'Hatch',
	year: '2018',
	bodyStyle: 'hatchback',
	fuseFamily: 'mini',
	batteryType: 'flooded',
	batteryAh: 50,
	startStop: false,
	hybridOrEv: false,
	curtainAirbags: 'yes',
	cameras: 'front-rear',
	cameraSupply: 'owner',
	power: 'hardwired-parking',
	removeOldUnit: false
};

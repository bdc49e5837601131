/**
 * Labour line items for a dash-cam fit. No published norms exist; the minutes are common trade
 * practice ranges, split so the usual job totals come out as the trade quotes them:
 * front plug-in 15–30 min, front hard-wired 30–60, front + rear sedan 60–120, front + rear
 * through a tailgate grommet 90–150, utes and vans 2–4 h; cabin camera +15–30, battery pack
 * +30–60, removing an old unit +30–60. Parking mode adds a test with the car asleep (20–60 min,
 * our estimate; see the line). Real fits should calibrate these.
 */
import type { LabourCalibration } from '../marketplace/calibration';
import type { BodyStyle, CameraSetup, PowerMode } from './request';

export type LabourCode =
	| 'front-camera'
	| 'power-socket'
	| 'power-fuse-tap'
	| 'power-obd'
	| 'battery-pack'
	| 'parking-mode-test'
	| 'rear-tailgate'
	| 'rear-sedan'
	| 'rear-ute'
	| 'rear-van'
	| 'long-body-allowance'
	| 'cabin-camera'
	| 'remove-old-unit';

export interface LabourLine {
	code: LabourCode;
	label: string;
	minMinutes: number;
	maxMinutes: number;
}

export interface LabourEstimate {
	lines: LabourLine[];
	minMinutes: number;
	maxMinutes: number;
	/**
	 * Set when the total was calibrated by reported fits of similar jobs ($lib/marketplace/calibration): the
	 * lines keep the trade's ranges, the total is moved. Absent on older sheets and thin data.
	 */
	calibration?: LabourCalibration;
}

export interface LabourInput {
	bodyStyle: BodyStyle;
	cameras: CameraSetup;
	power: PowerMode;
	removeOldUnit: boolean;
}

const LINES: Readonly<Record<LabourCode, LabourLine>> = {
	'front-camera': line(
		'front-camera',
		'Mount front camera; run cable along headliner and A-pillar',
		10,
		20
	),
	'power-socket': line('power-socket', 'Power from the accessory socket, lead tucked away', 5, 10),
	'power-fuse-tap': line(
		'power-fuse-tap',
		'Find and test supplies, fit fuse taps and ground',
		20,
		40
	),
	// Our estimate: OBD plugs in, but the lead still has to be routed and the cut-off set.
	'power-obd': line('power-obd', 'Power from the OBD port, lead routed, cut-off set', 10, 20),
	'battery-pack': line('battery-pack', 'Mount battery pack and route its charge lead', 30, 60),
	// Our estimate. The permanent supply and the switch into parking mode can only be checked
	// once the car is locked and asleep, and cars take from a few minutes to about an hour to go
	// to sleep (common trade practice); tidying trim overlaps part of the wait, so 20–60 min.
	'parking-mode-test': line(
		'parking-mode-test',
		'Test parking mode with the car locked and asleep (some cars take up to an hour to sleep)',
		20,
		60
	),
	'rear-tailgate': line('rear-tailgate', 'Rear camera; cable through the tailgate grommet', 60, 90),
	'rear-sedan': line(
		'rear-sedan',
		'Rear camera; cable through the parcel shelf and C-pillar',
		30,
		60
	),
	'rear-ute': line(
		'rear-ute',
		"Rear camera on the cab's rear window; cable along the headliner",
		60,
		90
	),
	'rear-van': line('rear-van', 'Rear camera; cable through the rear-door grommet', 60, 90),
	'long-body-allowance': line(
		'long-body-allowance',
		'Allowance for a long body and extra trim',
		30,
		90
	),
	'cabin-camera': line('cabin-camera', 'Mount cabin camera and route its cable', 15, 30),
	'remove-old-unit': line('remove-old-unit', 'Remove the old unit and its wiring', 30, 60)
};

const REAR_ROUTE: Readonly<Record<BodyStyle, LabourCode>> = {
	hatchback: 'rear-tailgate',
	wagon: 'rear-tailgate',
	suv: 'rear-tailgate',
	'people-mover': 'rear-tailgate',
	sedan: 'rear-sedan',
	ute: 'rear-ute',
	van: 'rear-van'
};

const POWER_LINES: Readonly<Record<PowerMode, readonly LabourCode[]>> = {
	socket: ['power-socket'],
	'hardwired-switched': ['power-fuse-tap'],
	'hardwired-parking': ['power-fuse-tap', 'parking-mode-test'],
	obd: ['power-obd', 'parking-mode-test'],
	// The pack charges from the accessory socket, so it adds to a plug-in fit.
	'battery-pack': ['power-socket', 'battery-pack']
};

/**
 * The labour lines for a job and their summed range.
 * @param input body style, cameras, power mode and whether an old unit comes out
 */
export function estimateLabour(input: LabourInput): LabourEstimate {
	const codes: LabourCode[] = ['front-camera', ...POWER_LINES[input.power]];
	if (input.cameras !== 'front') {
		codes.push(REAR_ROUTE[input.bodyStyle]);
		if (input.bodyStyle === 'ute' || input.bodyStyle === 'van') codes.push('long-body-allowance');
	}
	if (input.cameras === 'front-rear-cabin') codes.push('cabin-camera');
	if (input.removeOldUnit) codes.push('remove-old-unit');
	const lines = codes.map((code) => ({ ...LINES[code] }));
	return {
		lines,
		minMinutes: lines.reduce((sum, l) => sum + l.minMinutes, 0),
		maxMinutes: lines.reduce((sum, l) => sum + l.maxMinutes, 0)
	};
}

function line(code: LabourCode, label: string, minMinutes: number, maxMinutes: number): LabourLine {
	return { code, label, minMinutes, maxMinutes };
}

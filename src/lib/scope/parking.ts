/**
 * The parking-mode part of the scope sheet: the budget from battery.ts plus, in words, every
 * assumption it rests on (starting charge, camera draw, the car's own draw, the table, the
 * cut-off and the loaded-voltage caveat), so the owner can see why the hours are what they are.
 */
import {
	DEFAULT_START_STATE_OF_CHARGE,
	LOADED_VOLTAGE_NOTE,
	defaultCutOffVolts,
	defaultParkingDrawMilliamps,
	parkingBudget,
	type ParkingEstimate
} from './battery';
import type { CameraSetup, JobRequestInput } from './request';

export type ParkingAssumptionCode =
	'start-charge' | 'camera-draw' | 'standby-draw' | 'table' | 'cut-off' | 'loaded-voltage';

export interface ParkingAssumption {
	code: ParkingAssumptionCode;
	text: string;
}

export interface ParkingScope {
	drawMilliamps: number;
	/** True when the owner left the draw blank and the setup's default was used. */
	drawDefaulted: boolean;
	cutOffVolts: number;
	/** True when the owner left the cut-off blank and the battery-type default was used. */
	cutOffDefaulted: boolean;
	budget: ParkingEstimate;
	/** What the estimate rests on, in the order the sheet lists it. */
	assumptions: ParkingAssumption[];
}

const SETUP_WORDS: Readonly<Record<CameraSetup, string>> = {
	front: 'a front camera',
	'front-rear': 'front and rear cameras',
	'front-rear-cabin': 'front, rear and cabin cameras'
};

/** Where the default recording draws come from, as the sheet says it. */
export const CAMERA_DRAW_SOURCE =
	'the top of the usual recording draw (from memory: one camera 0.17–0.30 A, front and rear ' +
	"0.30–0.50 A; a cabin camera's extra 0.2 A is Tapline's estimate), because a parking mode " +
	'that keeps recording draws nearly as much as driving, and the top of the range errs short';

/**
 * The parking scope of a job, or null unless the camera stays powered while parked
 * (hard-wired parking mode or OBD power).
 * @param input a validated job request
 */
export function parkingScope(input: JobRequestInput): ParkingScope | null {
	if (input.power !== 'hardwired-parking' && input.power !== 'obd') return null;
	const drawMilliamps = input.parkingDrawMilliamps ?? defaultParkingDrawMilliamps(input.cameras);
	const cutOffVolts =
		input.cutOffVolts ?? defaultCutOffVolts(input.batteryType, input.startStop, input.hybridOrEv);
	const budget = parkingBudget({
		capacityAh: input.batteryAh,
		bodyStyle: input.bodyStyle,
		batteryType: input.batteryType,
		startStop: input.startStop,
		hybridOrEv: input.hybridOrEv,
		startVolts: input.restVolts,
		cutOffVolts,
		cameraDrawAmps: drawMilliamps / 1000
	});
	const scope = {
		drawMilliamps,
		drawDefaulted: input.parkingDrawMilliamps === undefined,
		cutOffVolts,
		cutOffDefaulted: input.cutOffVolts === undefined
	};
	return { ...scope, budget, assumptions: assumptionsFor(input.cameras, scope, budget) };
}

function assumptionsFor(
	cameras: CameraSetup,
	scope: Omit<ParkingScope, 'budget' | 'assumptions'>,
	budget: ParkingEstimate
): ParkingAssumption[] {
	if (!budget.estimated) return [];
	const list: ParkingAssumption[] = [];
	list.push({
		code: 'start-charge',
		text: budget.startMeasured
			? `Starting charge: ${Math.round(budget.startStateOfCharge)} %, from the ${budget.startVolts.toFixed(2)} V you measured at rest.`
			: `Starting charge: ${DEFAULT_START_STATE_OF_CHARGE} % (${budget.startVolts.toFixed(2)} V at rest), assumed because a parked car's battery is rarely full: short trips and the car's own standby draw keep it below full (common trade practice). Measure the rest voltage after the car has sat for a few hours for a better figure.`
	});
	list.push({
		code: 'camera-draw',
		text: scope.drawDefaulted
			? `Camera draw: ${scope.drawMilliamps} mA for ${SETUP_WORDS[cameras]}, ${CAMERA_DRAW_SOURCE}.`
			: `Camera draw: ${scope.drawMilliamps} mA, as you entered it.`
	});
	list.push({
		code: 'standby-draw',
		text: `The car's own standby draw: ${Math.round(budget.vehicleStandbyAmps * 1000)} mA, the top of the 25–50 mA a healthy car draws asleep (published: workshop manuals' battery drain tests), assumed.`
	});
	list.push({ code: 'table', text: `Charge read from the ${budget.table.name}.` });
	list.push({
		code: 'cut-off',
		text: scope.cutOffDefaulted
			? `Cut-off: ${scope.cutOffVolts.toFixed(1)} V, the usual setting for this battery and car (common trade practice), ${Math.round(budget.cutOffStateOfCharge)} % charge at rest.`
			: `Cut-off: ${scope.cutOffVolts.toFixed(1)} V as you chose, ${Math.round(budget.cutOffStateOfCharge)} % charge at rest.`
	});
	list.push({ code: 'loaded-voltage', text: LOADED_VOLTAGE_NOTE });
	return list;
}

/**
 * The parking figure for one-line job summaries (the installer's board), e.g. 'parking 33 h'.
 * @param parking the job's parking scope
 */
export function parkingSummary(parking: Pick<ParkingScope, 'budget'>): string {
	return parking.budget.estimated === false
		? 'parking not estimated'
		: `parking ${String(Math.floor(parking.budget.hours))} h`;
}

/**
 * How long parking mode can run before the hard-wire kit's cut-off switches the camera off.
 * hours = capacity x (SoC at start - SoC at cut-off) / (camera draw + car's standby draw)
 * (common trade practice). Every input the owner leaves out is assumed on the cautious side and
 * listed with its reason, so the sheet never shows a figure without saying what it rests on.
 */
import { CAMERA_RECORDING_AMPS } from './parts';
import {
	REST_VOLTS_MAX,
	REST_VOLTS_MIN,
	type BatteryType,
	type BodyStyle,
	type CameraSetup
} from './request';

export interface RestVoltagePoint {
	/** State of charge, percent. */
	soc: number;
	volts: number;
	source: 'published' | 'derived';
}

/** A rest-voltage table with the name the sheet shows for it. */
export interface RestVoltageTable {
	name: string;
	points: readonly RestVoltagePoint[];
}

/**
 * Rested 12 V flooded lead-acid battery at about 27 °C (published: Battery Council
 * International open-circuit voltage table). Ascending by voltage.
 */
export const FLOODED_REST_VOLTAGE_TABLE: readonly RestVoltagePoint[] = [
	{ soc: 0, volts: 11.89, source: 'published' },
	{ soc: 25, volts: 12.06, source: 'published' },
	{ soc: 50, volts: 12.24, source: 'published' },
	{ soc: 75, volts: 12.45, source: 'published' },
	{ soc: 100, volts: 12.65, source: 'published' }
];

/**
 * AGM rests higher. A different source (published: a powersports maker's owner's manual table)
 * gives 100 % about 12.8–13.2 V and 50 % about 12.3 V; we take 12.80 V (the low end, so any full
 * AGM reads 100 %) and 12.30 V. That is the flooded table shifted by +0.15 V at 100 % and
 * +0.06 V at 50 %; the other points are derived by Tapline, not published: the shift is
 * interpolated at 75 % (+0.105 V) and held at +0.06 V below 50 %, where the source gives nothing.
 */
export const AGM_REST_VOLTAGE_TABLE: readonly RestVoltagePoint[] = [
	{ soc: 0, volts: 11.95, source: 'derived' },
	{ soc: 25, volts: 12.12, source: 'derived' },
	{ soc: 50, volts: 12.3, source: 'published' },
	{ soc: 75, volts: 12.555, source: 'derived' },
	{ soc: 100, volts: 12.8, source: 'published' }
];

export const FLOODED_TABLE: RestVoltageTable = {
	name: 'Battery Council International open-circuit voltage table (flooded lead-acid, about 27 °C)',
	points: FLOODED_REST_VOLTAGE_TABLE
};

export const AGM_TABLE: RestVoltageTable = {
	name:
		"AGM rest voltages after a powersports maker's owner's-manual table: 100 % (12.80 V) and " +
		'50 % (12.30 V) published; 75 %, 25 % and 0 % derived by Tapline from the flooded table',
	points: AGM_REST_VOLTAGE_TABLE
};

/**
 * Where the estimate starts when the owner has not measured the battery: 75 % charge. A parked
 * car's battery is rarely full: short trips, the car's own standby draw and start-stop charge
 * management keep it below full, and a 100 % start roughly doubles the hours against a 75 % one
 * (common trade practice).
 */
export const DEFAULT_START_STATE_OF_CHARGE = 75;

/**
 * A healthy car asleep draws 25–50 mA (published: workshop manuals, battery drain tests); the
 * estimate takes the top of that range so it errs short.
 */
export const DEFAULT_VEHICLE_STANDBY_AMPS = 0.05;

/** Below this a flooded battery risks not cranking (common trade practice). */
export const MIN_SAFE_CUT_OFF_VOLTS = 12.0;
/**
 * AGM/EFB and start-stop batteries already run at partial charge, and a hybrid's or EV's small
 * 12 V battery must keep enough to switch the car on (common trade practice).
 */
export const MIN_SAFE_CUT_OFF_VOLTS_STRICT = 12.3;

/** Typical starter battery capacity by body style, used only when the owner does not know it (from memory). */
export const TYPICAL_CAPACITY_AH: Readonly<Record<BodyStyle, number>> = {
	hatchback: 45,
	sedan: 55,
	wagon: 60,
	suv: 70,
	ute: 80,
	van: 80,
	'people-mover': 70
};

/**
 * A hybrid's or EV's 12 V battery when the owner does not know it: a small AGM battery of
 * 35 Ah (from memory: auxiliary batteries in hybrids and EVs are often 35–45 Ah and AGM), the
 * cautious end.
 */
export const HYBRID_EV_CAPACITY_AH = 35;

/** Said whenever an estimate is shown: the kit measures under load. */
export const LOADED_VOLTAGE_NOTE =
	'The kit reads the voltage while the camera is drawing current, which sits a little below the ' +
	'resting voltage the table uses, so the cut-off trips somewhat earlier than this estimate ' +
	'(common trade practice).';

/** Why a 12 V lithium battery gets no estimate. */
export const LITHIUM_NOT_ESTIMATED =
	'Not estimated for a 12 V lithium battery: its voltage stays almost flat from full to nearly ' +
	'empty, so lead-acid voltage tables say nothing about its charge, and a cut-off set for ' +
	"lead-acid can let it run down to its own protection. Ask the vehicle maker or the kit's " +
	'maker for a setting made for lithium, or use a separate battery pack (common trade practice).';

export type ParkingWarningCode =
	| 'cut-off-too-low'
	| 'cut-off-at-or-above-start'
	| 'start-below-empty'
	| 'surface-charge'
	| 'capacity-assumed'
	| 'battery-type-assumed'
	| 'hybrid-ev';

export interface ParkingWarning {
	code: ParkingWarningCode;
	message: string;
}

export interface ParkingBudgetInput {
	/** 20-hour capacity in Ah; when absent a typical value is assumed. */
	capacityAh?: number;
	bodyStyle?: BodyStyle;
	batteryType?: BatteryType;
	startStop?: boolean;
	hybridOrEv?: boolean;
	/**
	 * Rest voltage the owner measured; when absent the estimate starts at
	 * {@link DEFAULT_START_STATE_OF_CHARGE}.
	 */
	startVolts?: number;
	cutOffVolts: number;
	cameraDrawAmps: number;
	vehicleStandbyAmps?: number;
}

/** An estimate, with what it assumed. */
export interface ParkingBudget {
	estimated: true;
	capacityAh: number;
	capacityAssumed: boolean;
	/** The battery type the table was chosen for (an unknown battery is read as flooded, or AGM in a hybrid/EV). */
	readAs: 'flooded' | 'agm';
	table: RestVoltageTable;
	startVolts: number;
	/** True when the owner measured the rest voltage; false when the default charge was assumed. */
	startMeasured: boolean;
	cutOffVolts: number;
	startStateOfCharge: number;
	cutOffStateOfCharge: number;
	cameraDrawAmps: number;
	vehicleStandbyAmps: number;
	usableAh: number;
	hours: number;
	days: number;
	warnings: ParkingWarning[];
}

/** No estimate, and why. */
export interface ParkingNotEstimated {
	estimated: false;
	reason: string;
	warnings: ParkingWarning[];
}

export type ParkingEstimate = ParkingBudget | ParkingNotEstimated;

/**
 * The rest-voltage table for a lead-acid battery type. EFB is flooded chemistry, and an unknown
 * battery is read as flooded (common trade practice).
 * @param type the battery type; lithium has no such table
 * @throws RangeError for lithium
 */
export function restVoltageTable(type: BatteryType): RestVoltageTable {
	if (type === 'lithium') throw new RangeError(LITHIUM_NOT_ESTIMATED);
	return type === 'agm' ? AGM_TABLE : FLOODED_TABLE;
}

/**
 * State of charge (percent, 0–100) of a rested battery from its open-circuit voltage,
 * interpolated linearly between table points and clamped outside the table.
 * @param volts rest voltage
 * @param type battery type (lead-acid)
 */
export function stateOfChargeFromRestVoltage(volts: number, type: BatteryType = 'flooded'): number {
	if (!Number.isFinite(volts)) throw new RangeError('volts must be a number');
	return interpolate(restVoltageTable(type).points, volts, 'volts', 'soc');
}

/**
 * The rest voltage of a battery at a state of charge, interpolated linearly between table points.
 * @param soc state of charge, percent, 0–100
 * @param type battery type (lead-acid)
 */
export function restVoltageAtStateOfCharge(soc: number, type: BatteryType = 'flooded'): number {
	if (!Number.isFinite(soc) || soc < 0 || soc > 100) {
		throw new RangeError('soc must be a percentage from 0 to 100');
	}
	return interpolate(restVoltageTable(type).points, soc, 'soc', 'volts');
}

/**
 * The camera draw assumed for parking mode when the owner does not give one: the recording draw
 * of the setup (see CAMERA_RECORDING_AMPS), because parking modes that keep recording can draw
 * nearly as much as driving does, and the top of each range errs short.
 * @param cameras the camera setup
 * @returns milliamps at 12 V
 */
export function defaultParkingDrawMilliamps(cameras: CameraSetup): number {
	return Math.round(CAMERA_RECORDING_AMPS[cameras] * 1000);
}

/**
 * The cut-off voltage to suggest when the owner does not choose one: 12.2 V for flooded,
 * 12.4 V for AGM/EFB, start-stop, a hybrid or EV, or a battery not known in a hybrid or EV
 * (common trade practice: 12.2–12.4 V keeps cranking reserve, higher for batteries that already
 * run at partial charge or must keep enough to switch the car on).
 * @param type battery type
 * @param startStop whether the car has engine start-stop
 * @param hybridOrEv whether the car is a hybrid or EV
 */
export function defaultCutOffVolts(
	type: BatteryType,
	startStop: boolean,
	hybridOrEv = false
): number {
	return needsStricterCutOff(type, startStop, hybridOrEv) ? 12.4 : 12.2;
}

/**
 * Estimates parking-mode runtime from battery capacity, voltages and draws, or says why it
 * cannot (a 12 V lithium battery).
 * @param input see ParkingBudgetInput
 * @throws RangeError for draws, capacities or voltages that are not finite numbers in range
 */
export function parkingBudget(input: ParkingBudgetInput): ParkingEstimate {
	const type = input.batteryType ?? 'unknown';
	const startStop = input.startStop ?? false;
	const hybridOrEv = input.hybridOrEv ?? false;
	const standby = input.vehicleStandbyAmps ?? DEFAULT_VEHICLE_STANDBY_AMPS;
	if (!Number.isFinite(input.cameraDrawAmps) || input.cameraDrawAmps <= 0) {
		throw new RangeError('cameraDrawAmps must be a positive number');
	}
	if (!Number.isFinite(standby) || standby < 0) throw new RangeError('bad vehicleStandbyAmps');
	if (!Number.isFinite(input.cutOffVolts)) throw new RangeError('cutOffVolts must be a number');
	if (input.startVolts !== undefined) assertRestVolts(input.startVolts);
	if (
		input.capacityAh !== undefined &&
		!(Number.isFinite(input.capacityAh) && input.capacityAh > 0)
	) {
		throw new RangeError('capacityAh must be a positive number');
	}
	const warnings: ParkingWarning[] = [];
	if (type === 'lithium') {
		return { estimated: false, reason: LITHIUM_NOT_ESTIMATED, warnings };
	}

	const readAs = type === 'agm' || (type === 'unknown' && hybridOrEv) ? 'agm' : 'flooded';
	let capacityAh = input.capacityAh;
	const capacityAssumed = capacityAh === undefined;
	if (hybridOrEv) {
		const battery = [
			capacityAh === undefined ? `${String(HYBRID_EV_CAPACITY_AH)} Ah` : '',
			type === 'unknown' ? 'AGM' : ''
		]
			.filter(Boolean)
			.join(' ');
		const article = battery.startsWith('AGM') ? 'an' : 'a';
		warnings.push({
			code: 'hybrid-ev',
			message:
				'Hybrid or EV: the 12 V battery is often small and AGM, and only charged while the car is ' +
				'switched on; if it runs flat the car may not switch on. The estimate assumes ' +
				`${battery ? `${article} ${battery} battery and ` : ''}a cut-off of at least ` +
				`${MIN_SAFE_CUT_OFF_VOLTS_STRICT.toFixed(1)} V.`
		});
	}
	if (capacityAh === undefined) {
		capacityAh = hybridOrEv
			? HYBRID_EV_CAPACITY_AH
			: TYPICAL_CAPACITY_AH[input.bodyStyle ?? 'hatchback'];
		warnings.push({
			code: 'capacity-assumed',
			message: hybridOrEv
				? `Battery capacity not given; assumed ${capacityAh} Ah, the small end for a hybrid's or EV's 12 V battery.`
				: `Battery capacity not given; assumed ${capacityAh} Ah, typical for this body style.`
		});
	}
	if (type === 'unknown') {
		warnings.push({
			code: 'battery-type-assumed',
			message: `Battery type not given; read as ${readAs === 'agm' ? 'an AGM' : 'a flooded'} battery.`
		});
	}

	const table = restVoltageTable(readAs);
	const empty = table.points[0]!;
	const full = table.points[table.points.length - 1]!;
	const startMeasured = input.startVolts !== undefined;
	const startVolts =
		input.startVolts ?? restVoltageAtStateOfCharge(DEFAULT_START_STATE_OF_CHARGE, readAs);
	const floor = needsStricterCutOff(type, startStop, hybridOrEv)
		? MIN_SAFE_CUT_OFF_VOLTS_STRICT
		: MIN_SAFE_CUT_OFF_VOLTS;
	if (input.cutOffVolts < floor) {
		warnings.push({
			code: 'cut-off-too-low',
			message: `A cut-off below ${floor.toFixed(1)} V risks the car not starting; choose ${floor.toFixed(1)} V or higher.`
		});
	}
	if (startVolts > full.volts) {
		warnings.push({
			code: 'surface-charge',
			message:
				`${startVolts.toFixed(2)} V is above a full battery's ${full.volts.toFixed(2)} V at rest: ` +
				'probably surface charge from driving or charging, which fades over a few hours. The ' +
				'estimate counts it as full; measure again after the car has sat for some hours.'
		});
	}

	const startStateOfCharge = stateOfChargeFromRestVoltage(startVolts, readAs);
	const cutOffStateOfCharge = stateOfChargeFromRestVoltage(input.cutOffVolts, readAs);
	let usableAh = (capacityAh * (startStateOfCharge - cutOffStateOfCharge)) / 100;
	if (startVolts <= empty.volts) {
		usableAh = 0;
		warnings.push({
			code: 'start-below-empty',
			message:
				`At ${startVolts.toFixed(2)} V at rest the battery is already flat by the table ` +
				`(${empty.volts.toFixed(2)} V is 0 %), so there is nothing for parking mode to use. ` +
				'Have the battery charged and tested before relying on parking mode.'
		});
	} else if (input.cutOffVolts >= startVolts || usableAh <= 0) {
		usableAh = 0;
		warnings.push({
			code: 'cut-off-at-or-above-start',
			message: `The ${input.cutOffVolts.toFixed(1)} V cut-off is at or above the battery's ${startVolts.toFixed(2)} V, so parking mode would not run.`
		});
	}
	const hours = usableAh / (input.cameraDrawAmps + standby);
	return {
		estimated: true,
		capacityAh,
		capacityAssumed,
		readAs,
		table,
		startVolts,
		startMeasured,
		cutOffVolts: input.cutOffVolts,
		startStateOfCharge,
		cutOffStateOfCharge,
		cameraDrawAmps: input.cameraDrawAmps,
		vehicleStandbyAmps: standby,
		usableAh,
		hours,
		days: hours / 24,
		warnings
	};
}

/**
 * Throws unless `volts` is a finite rest voltage a 12 V battery can read
 * ({@link REST_VOLTS_MIN}–{@link REST_VOLTS_MAX}).
 * @param volts the reading
 */
export function assertRestVolts(volts: number): void {
	if (!Number.isFinite(volts) || volts < REST_VOLTS_MIN || volts > REST_VOLTS_MAX) {
		throw new RangeError(
			`A rest voltage is a number from ${REST_VOLTS_MIN} V to ${REST_VOLTS_MAX} V, got ${String(volts)}`
		);
	}
}

function needsStricterCutOff(type: BatteryType, startStop: boolean, hybridOrEv: boolean): boolean {
	return startStop || hybridOrEv || type === 'agm' || type === 'efb';
}

function interpolate(
	points: readonly RestVoltagePoint[],
	value: number,
	from: 'soc' | 'volts',
	to: 'soc' | 'volts'
): number {
	const first = points[0];
	const last = points[points.length - 1];
	if (!first || !last) throw new Error('empty rest-voltage table');
	if (value <= first[from]) return first[to];
	if (value >= last[from]) return last[to];
	for (let i = 1; i < points.length; i++) {
		const low = points[i - 1];
		const high = points[i];
		if (low && high && value <= high[from]) {
			return low[to] + ((value - low[from]) / (high[from] - low[from])) * (high[to] - low[to]);
		}
	}
	return last[to];
}

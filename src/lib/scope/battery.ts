/**
 * How long parking mode can run before the hard-wire kit's cut-off switches the camera off.
 * hours = capacity x (SoC at start - SoC at cut-off) / (camera draw + car's standby draw)
 * (common trade practice). The kit reads voltage under load, which sits below rest voltage, so
 * real cut-off comes somewhat earlier than this estimate.
 */
import type { BatteryType, BodyStyle } from './request';

export interface RestVoltagePoint {
	/** State of charge, percent. */
	soc: number;
	volts: number;
	source: 'published' | 'derived';
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
 * +0.06 V at 50 %; the other points are derived: the shift is interpolated at 75 % (+0.105 V)
 * and held at +0.06 V below 50 %, where the source gives nothing.
 */
export const AGM_REST_VOLTAGE_TABLE: readonly RestVoltagePoint[] = [
	{ soc: 0, volts: 11.95, source: 'derived' },
	{ soc: 25, volts: 12.12, source: 'derived' },
	{ soc: 50, volts: 12.3, source: 'published' },
	{ soc: 75, volts: 12.555, source: 'derived' },
	{ soc: 100, volts: 12.8, source: 'published' }
];

/** Low-bitrate parking draw, top of the 0.08–0.25 A range (from memory), so estimates err short. */
export const DEFAULT_PARKING_DRAW_MILLIAMPS = 250;

/** A healthy car asleep draws 25–50 mA (published: workshop manuals, battery drain tests). */
export const DEFAULT_VEHICLE_STANDBY_AMPS = 0.035;

/** Below this a flooded battery risks not cranking (common trade practice). */
export const MIN_SAFE_CUT_OFF_VOLTS = 12.0;
/** AGM/EFB and start-stop batteries already run at partial charge (common trade practice). */
export const MIN_SAFE_CUT_OFF_VOLTS_START_STOP = 12.3;

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

export interface ParkingWarning {
	code:
		'cut-off-too-low' | 'cut-off-at-or-above-start' | 'capacity-assumed' | 'battery-type-assumed';
	message: string;
}

export interface ParkingBudgetInput {
	/** 20-hour capacity in Ah; when absent a typical value for the body style is assumed. */
	capacityAh?: number;
	bodyStyle?: BodyStyle;
	batteryType?: BatteryType;
	startStop?: boolean;
	/** Rest voltage when parked; default is the battery type's 100 % point (12.65 V flooded). */
	startVolts?: number;
	cutOffVolts: number;
	cameraDrawAmps: number;
	vehicleStandbyAmps?: number;
}

export interface ParkingBudget {
	capacityAh: number;
	capacityAssumed: boolean;
	startVolts: number;
	cutOffVolts: number;
	startStateOfCharge: number;
	cutOffStateOfCharge: number;
	usableAh: number;
	hours: number;
	days: number;
	warnings: ParkingWarning[];
}

/**
 * The rest-voltage table for a battery type. EFB is flooded chemistry, and an unknown battery is
 * read as flooded (common trade practice).
 * @param type the battery type
 */
export function restVoltageTable(type: BatteryType): readonly RestVoltagePoint[] {
	return type === 'agm' ? AGM_REST_VOLTAGE_TABLE : FLOODED_REST_VOLTAGE_TABLE;
}

/**
 * State of charge (percent, 0–100) of a rested battery from its open-circuit voltage,
 * interpolated linearly between table points and clamped outside the table.
 * @param volts rest voltage
 * @param type battery type
 */
export function stateOfChargeFromRestVoltage(volts: number, type: BatteryType = 'flooded'): number {
	if (!Number.isFinite(volts)) throw new RangeError('volts must be a number');
	const table = restVoltageTable(type);
	const first = table[0];
	const last = table[table.length - 1];
	if (!first || !last) throw new Error('empty rest-voltage table');
	if (volts <= first.volts) return first.soc;
	if (volts >= last.volts) return last.soc;
	for (let i = 1; i < table.length; i++) {
		const low = table[i - 1];
		const high = table[i];
		if (low && high && volts <= high.volts) {
			return low.soc + ((volts - low.volts) / (high.volts - low.volts)) * (high.soc - low.soc);
		}
	}
	return last.soc;
}

/**
 * The cut-off voltage to suggest when the owner does not choose one: 12.2 V for flooded,
 * 12.4 V for AGM/EFB or start-stop (common trade practice: 12.2–12.4 V keeps cranking reserve,
 * higher for batteries that already run at partial charge).
 * @param type battery type
 * @param startStop whether the car has engine start-stop
 */
export function defaultCutOffVolts(type: BatteryType, startStop: boolean): number {
	return needsStricterCutOff(type, startStop) ? 12.4 : 12.2;
}

/**
 * Estimates parking-mode runtime from battery capacity, voltages and draws.
 * @param input see ParkingBudgetInput
 */
export function parkingBudget(input: ParkingBudgetInput): ParkingBudget {
	const type = input.batteryType ?? 'unknown';
	const startStop = input.startStop ?? false;
	const standby = input.vehicleStandbyAmps ?? DEFAULT_VEHICLE_STANDBY_AMPS;
	const warnings: ParkingWarning[] = [];
	if (!Number.isFinite(input.cameraDrawAmps) || input.cameraDrawAmps <= 0) {
		throw new RangeError('cameraDrawAmps must be a positive number');
	}
	if (!Number.isFinite(standby) || standby < 0) throw new RangeError('bad vehicleStandbyAmps');
	if (!Number.isFinite(input.cutOffVolts)) throw new RangeError('cutOffVolts must be a number');

	let capacityAh = input.capacityAh;
	const capacityAssumed = capacityAh === undefined;
	if (capacityAh === undefined) {
		capacityAh = TYPICAL_CAPACITY_AH[input.bodyStyle ?? 'hatchback'];
		warnings.push({
			code: 'capacity-assumed',
			message: `Battery capacity not given; assumed ${capacityAh} Ah, typical for this body style.`
		});
	} else if (!Number.isFinite(capacityAh) || capacityAh <= 0) {
		throw new RangeError('capacityAh must be a positive number');
	}
	if (type === 'unknown') {
		warnings.push({
			code: 'battery-type-assumed',
			message: 'Battery type not given; read as a flooded battery.'
		});
	}

	const startVolts = input.startVolts ?? restVoltageTable(type).at(-1)?.volts ?? 12.65;
	const floor = needsStricterCutOff(type, startStop)
		? MIN_SAFE_CUT_OFF_VOLTS_START_STOP
		: MIN_SAFE_CUT_OFF_VOLTS;
	if (input.cutOffVolts < floor) {
		warnings.push({
			code: 'cut-off-too-low',
			message: `A cut-off below ${floor.toFixed(1)} V risks the car not starting; choose ${floor.toFixed(1)} V or higher.`
		});
	}

	const startStateOfCharge = stateOfChargeFromRestVoltage(startVolts, type);
	const cutOffStateOfCharge = stateOfChargeFromRestVoltage(input.cutOffVolts, type);
	let usableAh = (capacityAh * (startStateOfCharge - cutOffStateOfCharge)) / 100;
	if (input.cutOffVolts >= startVolts || usableAh <= 0) {
		usableAh = 0;
		warnings.push({
			code: 'cut-off-at-or-above-start',
			message: 'The cut-off is at or above the battery voltage, so parking mode would not run.'
		});
	}
	const hours = usableAh / (input.cameraDrawAmps + standby);
	return {
		capacityAh,
		capacityAssumed,
		startVolts,
		cutOffVolts: input.cutOffVolts,
		startStateOfCharge,
		cutOffStateOfCharge,
		usableAh,
		hours,
		days: hours / 24,
		warnings
	};
}

function needsStricterCutOff(type: BatteryType, startStop: boolean): boolean {
	return startStop || type === 'agm' || type === 'efb';
}

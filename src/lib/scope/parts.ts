/**
 * Parts list for a dash-cam fit: fuse taps and their fuses, ground terminal, ties, cable
 * extension and the power kit. Quantities follow common trade practice.
 */
import { fuseForAccessory, type FuseFamily } from './fuses';
import type { BodyStyle, CameraSetup, CameraSupply, FuseFamilyAnswer, PowerMode } from './request';

export type PartCode =
	| `fuse-tap-${FuseFamilyAnswer}`
	| 'accessory-fuse'
	| 'ring-terminal'
	| 'cable-ties'
	| 'rear-cable-extension'
	| 'hardwire-kit'
	| 'hardwire-kit-cut-off'
	| 'obd-cable-cut-off'
	| 'battery-pack'
	| 'camera';

export interface Part {
	code: PartCode;
	label: string;
	quantity: number;
	note?: string;
}

export interface PartsInput {
	bodyStyle: BodyStyle;
	fuseFamily: FuseFamilyAnswer;
	cameras: CameraSetup;
	cameraSupply: CameraSupply;
	power: PowerMode;
}

export interface RearCableNeed {
	minMetres: number;
	maxMetres: number;
	/** Metres beyond the stock cable, rounded up to whole metres; 0 when the stock cable reaches. */
	extensionMetres: number;
}

/** A common stock length for rear camera cable (common trade practice). */
export const STOCK_REAR_CABLE_METRES = 6;

/**
 * Rear cable run by body style (common trade practice): hatch or sedan 4–5 m, SUV/wagon
 * 5–6.5 m, seven-seater 6–7 m, long van 8–12 m. The ute run to the cab's rear window is our
 * estimate.
 */
export const REAR_CABLE_METRES: Readonly<Record<BodyStyle, { min: number; max: number }>> = {
	hatchback: { min: 4, max: 5 },
	sedan: { min: 4, max: 5 },
	wagon: { min: 5, max: 6.5 },
	suv: { min: 5, max: 6.5 },
	'people-mover': { min: 6, max: 7 },
	van: { min: 8, max: 12 },
	ute: { min: 3, max: 4 }
};

/**
 * Steady draw at 12 V while recording, used to size the added fuse. Upper ends of the typical
 * ranges (from memory: one channel 0.17–0.30 A, front + rear 0.30–0.50 A); the cabin channel's
 * extra 0.2 A is our estimate.
 */
export const CAMERA_RECORDING_AMPS: Readonly<Record<CameraSetup, number>> = {
	front: 0.3,
	'front-rear': 0.5,
	'front-rear-cabin': 0.7
};

const FAMILY_LABELS: Readonly<Record<FuseFamilyAnswer, string>> = {
	standard: 'standard blade',
	mini: 'mini blade',
	'low-profile-mini': 'low-profile mini',
	micro2: 'micro2',
	micro3: 'micro3',
	unknown: 'blade'
};

/**
 * How much rear cable the body style needs and how much extension beyond the stock length.
 * @param bodyStyle the vehicle's body style
 */
export function rearCableNeed(bodyStyle: BodyStyle): RearCableNeed {
	const { min, max } = REAR_CABLE_METRES[bodyStyle];
	return {
		minMetres: min,
		maxMetres: max,
		extensionMetres: Math.max(0, Math.ceil(max - STOCK_REAR_CABLE_METRES))
	};
}

/**
 * How many fuse taps the power mode needs: parking mode takes a switched and a permanent supply,
 * switched-only takes one, and socket, OBD and battery-pack power take none.
 * @param power the power mode
 */
export function fuseTapCount(power: PowerMode): number {
	if (power === 'hardwired-parking') return 2;
	if (power === 'hardwired-switched') return 1;
	return 0;
}

/**
 * The parts list for a job.
 * @param input body style, fuse family, cameras, who supplies the camera and power mode
 */
export function listParts(input: PartsInput): Part[] {
	const parts: Part[] = [];
	if (input.cameraSupply === 'installer') {
		parts.push({
			code: 'camera',
			label: `Dash camera (${cameraLabel(input.cameras)})`,
			quantity: 1,
			note: "Installer supplies it within the owner's budget."
		});
	}
	parts.push(...powerParts(input));
	if (input.cameras !== 'front') {
		const need = rearCableNeed(input.bodyStyle);
		if (need.extensionMetres > 0) {
			parts.push({
				code: 'rear-cable-extension',
				label: `Rear cable extension, ${need.extensionMetres} m`,
				quantity: 1,
				note: `The run is ${need.minMetres}–${need.maxMetres} m; the usual stock cable is ${STOCK_REAR_CABLE_METRES} m.`
			});
		}
	}
	parts.push({ code: 'cable-ties', label: 'Cable ties', quantity: cableTieCount(input.cameras) });
	return parts;
}

function powerParts(input: PartsInput): Part[] {
	const taps = fuseTapCount(input.power);
	const parts: Part[] = [];
	if (input.power === 'hardwired-switched') {
		parts.push({ code: 'hardwire-kit', label: 'Hard-wire kit (switched supply)', quantity: 1 });
	} else if (input.power === 'hardwired-parking') {
		parts.push({
			code: 'hardwire-kit-cut-off',
			label: 'Hard-wire kit with low-voltage cut-off (switched + permanent)',
			quantity: 1
		});
	} else if (input.power === 'obd') {
		parts.push({
			code: 'obd-cable-cut-off',
			label: 'OBD power cable with low-voltage cut-off',
			quantity: 1,
			note: 'The OBD port is always live, so the cut-off is not optional.'
		});
	} else if (input.power === 'battery-pack') {
		parts.push({ code: 'battery-pack', label: 'Dash-cam battery pack', quantity: 1 });
	}
	if (taps === 0) return parts;

	const family = input.fuseFamily;
	parts.push({
		code: `fuse-tap-${family}`,
		label: `Fuse tap, ${FAMILY_LABELS[family]}`,
		quantity: taps,
		note: fuseTapNote(family, taps)
	});
	// Size for the tap's own family; with the family unknown, size as a standard blade (same
	// ratings and colours as mini and low-profile mini).
	const sizingFamily: FuseFamily = family === 'unknown' ? 'standard' : family;
	const fuse = fuseForAccessory(CAMERA_RECORDING_AMPS[input.cameras], undefined, sizingFamily);
	parts.push({
		code: 'accessory-fuse',
		label: `${fuse.amps ?? '?'} A ${FAMILY_LABELS[family]} fuse${fuse.colour ? ` (${fuse.colour})` : ''}`,
		quantity: taps,
		note: "One for each tap's added slot; never larger than the fuse already in that slot."
	});
	parts.push({
		code: 'ring-terminal',
		label: 'Ring terminal for the ground lead',
		quantity: 1,
		note: 'To a bare-metal body stud or factory ground bolt near the fuse box.'
	});
	return parts;
}

/**
 * How a two-slot tap is filled (tap makers' instructions; common trade practice): the car's own
 * fuse in the slot that feeds the car's circuit, the new small fuse in the added slot.
 */
export const TWO_SLOT_TAP_NOTE =
	"Original fuse in the slot that feeds the car's circuit, the new small fuse in the added slot; " +
	'common blade on the supply side (checked with a test light or multimeter). An unused exposed ' +
	'blade is insulated or removed.';

function fuseTapNote(family: FuseFamilyAnswer, taps: number): string {
	const supplies = `${
		taps === 2 ? 'One on a switched supply, one on a permanent supply.' : 'On a switched supply.'
	} ${TWO_SLOT_TAP_NOTE}`;
	if (family === 'unknown') return `${supplies} The installer confirms the fuse family on the day.`;
	if (family === 'micro3') {
		return `${supplies} Micro3 slots carry two circuits and need their own three-blade tap; otherwise use another slot.`;
	}
	return supplies;
}

function cameraLabel(cameras: CameraSetup): string {
	if (cameras === 'front') return 'front';
	if (cameras === 'front-rear') return 'front and rear';
	return 'front, rear and cabin';
}

function cableTieCount(cameras: CameraSetup): number {
	// Our estimate for the length of run, rounded generously; ties are cheap.
	if (cameras === 'front') return 10;
	return cameras === 'front-rear' ? 25 : 30;
}

/**
 * The job scope sheet: labour, parts, parking-mode budget, price guide and cautions, computed
 * from the owner's answers. Pure: no I/O, safe in the browser and in tests.
 */
import { calibrateLabour } from '../marketplace/calibration';
import { cautionsFor, type Caution } from './cautions';
import { estimateLabour, type LabourEstimate } from './labour';
import { parkingScope, type ParkingScope } from './parking';
import { listParts, rearCableNeed, type Part, type RearCableNeed } from './parts';
import { ADELAIDE_MARKET, priceGuide, type Market, type PriceGuide } from './price';
import type { JobRequestInput } from './request';

export * from './battery';
export * from './cautions';
export * from './fuses';
export * from './labour';
export * from './parking';
export * from './parts';
export * from './price';
export * from './request';

export interface ScopeSheet {
	labour: LabourEstimate;
	parts: Part[];
	/** Null for a front-only job. */
	rearCable: RearCableNeed | null;
	/** Null unless the camera stays powered while parked (hard-wired parking mode or OBD). */
	parking: ParkingScope | null;
	price: PriceGuide;
	cautions: Caution[];
}

/**
 * Builds the scope sheet for a validated job request.
 * @param input a request that passed `jobRequestSchema`
 * @param market rates and prices; the Adelaide demo market by default
 * @param fitMinutes minutes reported on similar fits (same body style, cameras, power); with
 *   enough of them the labour total (and so the price guide) is calibrated ($lib/marketplace/calibration)
 */
export function computeScope(
	input: JobRequestInput,
	market: Market = ADELAIDE_MARKET,
	fitMinutes: readonly number[] = []
): ScopeSheet {
	const labour = withCalibration(estimateLabour(input), fitMinutes);
	const parts = listParts(input);
	const cameraBudgetCents = input.cameraSupply === 'installer' ? (input.cameraBudgetCents ?? 0) : 0;
	return {
		labour,
		parts,
		rearCable: input.cameras === 'front' ? null : rearCableNeed(input.bodyStyle),
		parking: parkingScope(input),
		price: priceGuide(labour, parts, market, cameraBudgetCents),
		cautions: cautionsFor(input)
	};
}

function withCalibration(labour: LabourEstimate, fitMinutes: readonly number[]): LabourEstimate {
	const calibrated = calibrateLabour(labour, fitMinutes);
	if (!calibrated.calibration) return labour;
	return {
		...labour,
		minMinutes: calibrated.minMinutes,
		maxMinutes: calibrated.maxMinutes,
		calibration: calibrated.calibration
	};
}

/**
 * Price guide: labour rate x minimum and maximum time, plus parts, in integer AUD cents.
 *
 * Rules, in order:
 * 1. Labour is costed on the summed minutes: rate x minutes / 60, rounded half up to the cent.
 * 2. Market rates and part prices are GST-exclusive; GST is added once to labour + parts, rounded
 *    half up to the cent (money.ts).
 * 3. A camera the installer supplies is priced at the owner's budget, which is already
 *    GST-inclusive, and added after step 2.
 * 4. The GST shown is the GST contained in the inclusive total: round(total / 11) at 10 %
 *    (Australian Taxation Office guidance).
 */
import { addGst, assertCents, gstFromInclusive, scaleCents } from '../money/money';
import type { LabourEstimate } from './labour';
import type { Part, PartCode } from './parts';

export type PricedPartCode = Exclude<PartCode, 'camera'>;

export interface Market {
	code: string;
	name: string;
	currency: 'AUD';
	/** IANA zone the market's times are shown in. */
	timeZone: string;
	/** GST-exclusive labour rate. */
	labourRateCentsPerHour: number;
	/** 1000 = 10 %. */
	gstRateBasisPoints: number;
	/** GST-exclusive unit prices. */
	partPricesCents: Readonly<Record<PricedPartCode, number>>;
}

/** The demo market. Rates and prices are invented for the demo, not survey data. */
export const ADELAIDE_MARKET: Market = {
	code: 'adelaide',
	name: 'Adelaide',
	currency: 'AUD',
	timeZone: 'Australia/Adelaide',
	labourRateCentsPerHour: 11_000,
	gstRateBasisPoints: 1000,
	partPricesCents: {
		'fuse-tap-standard': 450,
		'fuse-tap-mini': 450,
		'fuse-tap-low-profile-mini': 500,
		'fuse-tap-micro2': 650,
		'fuse-tap-micro3': 950,
		// Priced as the dearer common tap until the family is confirmed.
		'fuse-tap-unknown': 650,
		'accessory-fuse': 80,
		'ring-terminal': 60,
		'cable-ties': 10,
		'rear-cable-extension': 1_900,
		'hardwire-kit': 2_500,
		'hardwire-kit-cut-off': 3_900,
		'obd-cable-cut-off': 3_500,
		'battery-pack': 29_900
	}
};

export interface CentsRange {
	min: number;
	max: number;
}

export interface PricedPart {
	code: PartCode;
	quantity: number;
	/** GST-exclusive, except the owner-budgeted camera which is GST-inclusive. */
	unitCents: number;
	totalCents: number;
}

export interface PriceGuide {
	currency: 'AUD';
	labourRateCentsPerHour: number;
	labourExGst: CentsRange;
	partsExGst: number;
	cameraIncGst: number;
	parts: PricedPart[];
	totalIncGst: CentsRange;
	gstIncluded: CentsRange;
}

/**
 * Labour cost in cents for a number of minutes, rounded half up to the cent.
 * @param rateCentsPerHour GST-exclusive hourly rate
 * @param minutes whole minutes
 */
export function labourCostCents(rateCentsPerHour: number, minutes: number): number {
	return scaleCents(rateCentsPerHour, minutes, 60);
}

/**
 * Prices a scope: labour range, parts and the GST-inclusive range with its GST.
 * @param labour the labour estimate
 * @param parts the parts list
 * @param market rates and prices
 * @param cameraBudgetCents GST-inclusive budget for an installer-supplied camera
 */
export function priceGuide(
	labour: LabourEstimate,
	parts: readonly Part[],
	market: Market,
	cameraBudgetCents = 0
): PriceGuide {
	assertCents(cameraBudgetCents, 'cameraBudgetCents');
	const priced = parts.map((part): PricedPart => {
		const unitCents =
			part.code === 'camera' ? cameraBudgetCents : market.partPricesCents[part.code];
		assertCents(unitCents, `price of ${part.code}`);
		return {
			code: part.code,
			quantity: part.quantity,
			unitCents,
			totalCents: unitCents * part.quantity
		};
	});
	const cameraIncGst = sum(priced.filter((p) => p.code === 'camera').map((p) => p.totalCents));
	const partsExGst = sum(priced.filter((p) => p.code !== 'camera').map((p) => p.totalCents));
	const labourExGst = {
		min: labourCostCents(market.labourRateCentsPerHour, labour.minMinutes),
		max: labourCostCents(market.labourRateCentsPerHour, labour.maxMinutes)
	};
	const inclusive = (labourCents: number) =>
		addGst(labourCents + partsExGst, market.gstRateBasisPoints) + cameraIncGst;
	const totalIncGst = { min: inclusive(labourExGst.min), max: inclusive(labourExGst.max) };
	return {
		currency: market.currency,
		labourRateCentsPerHour: market.labourRateCentsPerHour,
		labourExGst,
		partsExGst,
		cameraIncGst,
		parts: priced,
		totalIncGst,
		gstIncluded: {
			min: gstFromInclusive(totalIncGst.min, market.gstRateBasisPoints),
			max: gstFromInclusive(totalIncGst.max, market.gstRateBasisPoints)
		}
	};
}

function sum(values: readonly number[]): number {
	return values.reduce((total, value) => total + value, 0);
}

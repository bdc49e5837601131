/** How a quote is priced and checked: GST-inclusive integer cents, slots against the diary. Pure. */
import { quoteGstCents } from '../money/gst';
import { assertCents, scaleCents } from '../money/money';
import {
	formatSlotStart,
	isFree,
	isWithinWorkingHours,
	type Interval,
	type WeeklyHours
} from '../work/schedule';

/**
 * Travel fee for a mobile fit: the installer's rate per km for each whole or part km beyond the
 * free radius (one way). Part kilometres round up, as odometer-based trade charges do [common
 * trade practice].
 * @param distanceKm one-way distance to the job
 * @param freeRadiusKm distance travelled free
 * @param centsPerKm GST-inclusive rate beyond the free radius
 */
export function travelFeeCents(distanceKm: number, freeRadiusKm: number, centsPerKm: number) {
	assertCents(centsPerKm, 'centsPerKm');
	if (!(distanceKm >= 0) || !(freeRadiusKm >= 0)) throw new RangeError('distances must be ≥ 0');
	// Tenths first, so 12.0000000001 km from float noise does not bill a 13th km.
	const beyond = Math.max(0, Math.round((distanceKm - freeRadiusKm) * 1000) / 1000);
	return Math.ceil(beyond) * centsPerKm;
}

/**
 * A quote total above this is refused as a typo: $20,000 including GST. The dearest fits on the
 * scope sheet (vans with front, rear and cabin cameras plus a battery pack) stay well under
 * $2,500 on the demo market's rates, so eight times that is no real dash-cam job. Tapline's choice.
 */
export const MAX_QUOTE_TOTAL_CENTS = 2_000_000;

/** Longest a quote may stay open, in days (Tapline's choice: prices and diaries drift). */
export const MAX_QUOTE_VALID_DAYS = 60;

/** A quote carries two or three proposed slots. */
export const MIN_QUOTE_SLOTS = 2;
export const MAX_QUOTE_SLOTS = 3;

/** One line of a quote as priced: GST-inclusive integer cents. */
export interface PricedLine {
	kind: 'labour' | 'part' | 'travel' | 'camera';
	label: string;
	quantity: number;
	unitCents: number;
	totalCents: number;
}

/** What the installer enters, in GST-inclusive cents. */
export interface QuotePriceInput {
	labour: { label: string; cents: number };
	parts: ReadonlyArray<{ label: string; quantity: number; unitCents: number }>;
	camera: { label: string; cents: number } | null;
	travelCents: number;
	travelLabel: string;
	/** Whether the installer is registered for GST; unregistered quotes carry none. */
	gstRegistered: boolean;
}

/** A priced quote: its lines and totals. Camera counts with the parts. */
export interface QuotePrice {
	lines: PricedLine[];
	labourCents: number;
	partsCents: number;
	travelCents: number;
	totalCents: number;
	gstCents: number;
}

/**
 * Prices a quote: one labour line, one line per part, an optional camera line and a travel line
 * (omitted at zero), all what the owner pays; the GST shown is 1/11 of the total, rounded half up
 * to the cent (Australian Taxation Office: GST in a GST-inclusive price at 10 %), and none when
 * the installer is not registered for GST (see $lib/money/gst).
 * @param input the installer's amounts
 */
export function priceQuote(input: QuotePriceInput): QuotePrice {
	const amounts = [
		input.labour.cents,
		input.travelCents,
		input.camera?.cents ?? 0,
		...input.parts.map((p) => p.unitCents)
	];
	for (const cents of amounts) {
		assertCents(cents);
		if (cents < 0) throw new RangeError('Amounts cannot be negative');
	}
	const lines: PricedLine[] = [
		{
			kind: 'labour',
			label: input.labour.label,
			quantity: 1,
			unitCents: input.labour.cents,
			totalCents: input.labour.cents
		},
		...input.parts.map((p): PricedLine => ({
			kind: 'part',
			label: p.label,
			quantity: p.quantity,
			unitCents: p.unitCents,
			totalCents: scaleCents(p.unitCents, p.quantity, 1)
		}))
	];
	if (input.camera) {
		lines.push({
			kind: 'camera',
			label: input.camera.label,
			quantity: 1,
			unitCents: input.camera.cents,
			totalCents: input.camera.cents
		});
	}
	if (input.travelCents > 0) {
		lines.push({
			kind: 'travel',
			label: input.travelLabel,
			quantity: 1,
			unitCents: input.travelCents,
			totalCents: input.travelCents
		});
	}
	const sumOf = (kinds: PricedLine['kind'][]) =>
		lines.filter((l) => kinds.includes(l.kind)).reduce((s, l) => s + l.totalCents, 0);
	const totalCents = sumOf(['labour', 'part', 'camera', 'travel']);
	return {
		lines,
		labourCents: sumOf(['labour']),
		partsCents: sumOf(['part', 'camera']),
		travelCents: sumOf(['travel']),
		totalCents,
		gstCents: quoteGstCents(totalCents, input.gstRegistered)
	};
}

/** Everything the quote checks need besides the price. */
export interface QuoteCheckInput {
	totalCents: number;
	slots: readonly Interval[];
	hours: WeeklyHours;
	blocked: readonly string[];
	bookings: readonly Interval[];
	timeZone: string;
	expiresAt: Date;
	now: Date;
}

/**
 * Reasons a quote cannot be sent, in words for the installer; empty when it can.
 * @param input the total, proposed slots, the installer's hours and bookings, and the expiry
 */
export function quoteProblems(input: QuoteCheckInput): string[] {
	const problems: string[] = [];
	if (input.totalCents <= 0) problems.push('A quote needs a total above $0.');
	if (input.totalCents > MAX_QUOTE_TOTAL_CENTS) {
		problems.push(
			'A total over $20,000 is far beyond any dash-cam fit; check the amounts for a typo.'
		);
	}
	const count = input.slots.length;
	if (count < MIN_QUOTE_SLOTS || count > MAX_QUOTE_SLOTS) {
		problems.push('Offer two or three times for the fit.');
	}
	const sorted = [...input.slots].sort((a, b) => a.start.getTime() - b.start.getTime());
	sorted.forEach((slot, i) => {
		const label = `The time ${formatSlotStart(slot.start, input.timeZone, input.now)}`;
		if (slot.end.getTime() <= slot.start.getTime()) {
			problems.push(`${label} ends before it starts.`);
			return;
		}
		if (slot.start.getTime() <= input.now.getTime()) {
			problems.push(`${label} is in the past.`);
		}
		if (!isWithinWorkingHours(slot, input.hours, input.blocked, input.timeZone)) {
			problems.push(`${label} is outside your working hours.`);
		}
		if (!isFree(slot, input.bookings)) problems.push(`${label} clashes with one of your bookings.`);
		const previous = sorted[i - 1];
		if (previous && previous.end.getTime() > slot.start.getTime()) {
			problems.push(`${label} overlaps another time you offered.`);
		}
	});
	if (input.expiresAt.getTime() <= input.now.getTime()) {
		problems.push('The expiry date has passed; choose a later one.');
	} else if (input.expiresAt.getTime() > input.now.getTime() + MAX_QUOTE_VALID_DAYS * 86_400_000) {
		problems.push(`A quote can stay open for at most ${String(MAX_QUOTE_VALID_DAYS)} days.`);
	}
	return problems;
}

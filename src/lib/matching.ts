/**
 * Which installers a job is offered to, and how a quote is priced and checked. Pure: no I/O, so
 * the job board, the quote form, the server and the tests share one source of truth.
 */
import { distanceKm, snapToGrid, withinServiceArea, type LatLng } from './geo';
import { quoteGstCents } from './gst';
import { assertCents, scaleCents } from './money';
import {
	formatSlotStart,
	isFree,
	isWithinWorkingHours,
	type Interval,
	type WeeklyHours
} from './schedule';
import type { BodyStyle, CameraSetup, JobRequestInput, PowerMode } from './scope/request';
import { SKILL_LABELS, type InstallerSkill } from './vetting';

/** What the skills check needs to know about a job request. */
export type SkillNeeds = Pick<JobRequestInput, 'bodyStyle' | 'cameras' | 'power'>;

/** Body styles whose rear camera cable goes through a tailgate grommet (common trade practice). */
const TAILGATE_BODIES: ReadonlySet<SkillNeeds['bodyStyle']> = new Set([
	'hatchback',
	'wagon',
	'suv',
	'people-mover'
]);

/**
 * The installer skills a job needs, in the order of INSTALLER_SKILLS. Hard-wired parking mode
 * needs someone who finds and tests a permanent supply; OBD power needs the OBD skill; a rear
 * camera on a tailgated body needs the grommet run; utes and vans need their own skill; a cabin
 * camera needs its own.
 * @param request the job's vehicle, cameras and power
 */
export function requiredSkills(request: SkillNeeds): InstallerSkill[] {
	const needs: InstallerSkill[] = [];
	if (request.power === 'hardwired-parking') needs.push('parking-mode');
	if (request.cameras !== 'front' && TAILGATE_BODIES.has(request.bodyStyle)) {
		needs.push('tailgate-rear');
	}
	if (request.bodyStyle === 'ute' || request.bodyStyle === 'van') needs.push('vans-utes');
	if (request.power === 'obd') needs.push('obd-power');
	if (request.cameras === 'front-rear-cabin') needs.push('cabin-camera');
	return needs;
}

/**
 * The skills a job needs that the installer has not listed; empty when they cover it.
 * @param needed from {@link requiredSkills}
 * @param has the installer's skills
 */
export function missingSkills(needed: readonly InstallerSkill[], has: readonly string[]) {
	return needed.filter((skill) => !has.includes(skill));
}

/** The facts about an installer that decide whether a job is offered to them. */
export interface InstallerReach {
	base: LatLng;
	serviceRadiusKm: number;
	skills: readonly string[];
	offersMobile: boolean;
	offersWorkshop: boolean;
}

/** The facts about a job that decide who it is offered to. */
export interface JobReach {
	location: LatLng;
	locationMode: 'mobile' | 'workshop' | null;
	needs: SkillNeeds;
}

/** Why a job is not offered to an installer, in words for the installer. */
export type MatchProblem =
	| { kind: 'outside-area'; message: string }
	| { kind: 'skills'; message: string }
	| { kind: 'mode'; message: string };

/**
 * Whether a job is offered to an installer: inside the service circle (great-circle distance,
 * inclusive), skills cover the job, and they work the way it asks (at the owner's place or at a
 * workshop). Vetting and pauses are checked separately, where the profile is read.
 * @returns null when it matches, otherwise the first reason it does not
 */
export function matchProblem(job: JobReach, installer: InstallerReach): MatchProblem | null {
	if (!withinServiceArea(job.location, installer.base, installer.serviceRadiusKm)) {
		return {
			kind: 'outside-area',
			message: `This job is outside your service area of ${String(installer.serviceRadiusKm)} km.`
		};
	}
	const missing = missingSkills(requiredSkills(job.needs), installer.skills);
	if (missing.length > 0) {
		return {
			kind: 'skills',
			message: `This job needs skills you have not listed: ${missing.map((s) => SKILL_LABELS[s].toLowerCase()).join(', ')}.`
		};
	}
	if (job.locationMode === 'mobile' && !installer.offersMobile) {
		return { kind: 'mode', message: "This job is at the owner's place and you fit at a workshop." };
	}
	if (job.locationMode === 'workshop' && !installer.offersWorkshop) {
		return { kind: 'mode', message: 'This job is at a workshop and you fit on the road only.' };
	}
	return null;
}

/**
 * Where an installer is told a job is: the centre of its ~1 km grid cell, and the distance from
 * their base to that centre rounded to 0.1 km. The distance is measured to the cell centre, not
 * to the job, so it cannot be combined with the installer's own base to narrow the cell down.
 * @param job the job's true location
 * @param base the installer's base
 */
export function approximateLocation(job: LatLng, base: LatLng) {
	const snapped = snapToGrid(job);
	return {
		lat: snapped.lat,
		lng: snapped.lng,
		cellId: snapped.cellId,
		distanceKm: Math.round(distanceKm(base, snapped) * 10) / 10
	};
}

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
 * the installer is not registered for GST (see $lib/gst).
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
		const label = `The time ${formatSlotStart(slot.start, input.timeZone)}`;
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

/**
 * A keyset cursor for lists sorted by one value then id: opaque to clients (base64url JSON).
 * @param value the sort value of the last row sent
 * @param id the id of the last row sent
 */
export function encodeCursor(value: number | string, id: string): string {
	return btoa(JSON.stringify([value, id]))
		.replace(/\+/g, '-')
		.replace(/\//g, '_')
		.replace(/=+$/, '');
}

/**
 * Reads a cursor made by {@link encodeCursor}; null when it is not one.
 * @param cursor the client's cursor
 */
export function decodeCursor(cursor: string): { value: number | string; id: string } | null {
	try {
		const padded = cursor.replace(/-/g, '+').replace(/_/g, '/');
		const parsed: unknown = JSON.parse(atob(padded));
		if (
			Array.isArray(parsed) &&
			parsed.length === 2 &&
			(typeof parsed[0] === 'number' || typeof parsed[0] === 'string') &&
			typeof parsed[1] === 'string'
		) {
			return { value: parsed[0], id: parsed[1] };
		}
		return null;
	} catch {
		return null;
	}
}

/**
 * One page of rows sorted by (value, id), starting after the cursor.
 * @param rows all rows, in any order
 * @param key the sort value of a row
 * @param dir ascending or descending by value (ids always ascending within a value)
 * @param after the decoded cursor, or null for the first page
 * @param limit page size
 */
export function pageAfter<T extends { id: string }>(
	rows: readonly T[],
	key: (row: T) => number | string,
	dir: 'asc' | 'desc',
	after: { value: number | string; id: string } | null,
	limit: number
): { page: T[]; nextCursor: string | null } {
	const sign = dir === 'asc' ? 1 : -1;
	const compare = (a: number | string, aId: string, b: number | string, bId: string) =>
		(a < b ? -1 : a > b ? 1 : 0) * sign || (aId < bId ? -1 : aId > bId ? 1 : 0);
	const sorted = [...rows].sort((a, b) => compare(key(a), a.id, key(b), b.id));
	const rest = after
		? sorted.filter((r) => compare(key(r), r.id, after.value, after.id) > 0)
		: sorted;
	const page = rest.slice(0, limit);
	const last = page.at(-1);
	return {
		page,
		nextCursor: rest.length > limit && last ? encodeCursor(key(last), last.id) : null
	};
}

export const BOARD_SORTS = ['distance', 'newest', 'date', 'quotes'] as const;
export type BoardSort = (typeof BOARD_SORTS)[number];

/** The natural direction of each board sort: nearest, newest, soonest, fewest quotes first. */
export const BOARD_DEFAULT_DIR: Record<BoardSort, 'asc' | 'desc'> = {
	distance: 'asc',
	newest: 'desc',
	date: 'asc',
	quotes: 'asc'
};

export const BOARD_SORT_LABELS: Record<BoardSort, string> = {
	distance: 'Nearest first',
	newest: 'Newest first',
	date: 'Soonest preferred date',
	quotes: 'Fewest quotes so far'
};

/** One job on the installer's board: never the owner, the address or the exact point. */
export interface BoardJob {
	id: string;
	title: string;
	suburb: string | null;
	/** Centre of the job's ~1 km grid cell. */
	lat: number;
	lng: number;
	/** From the installer's base to the cell centre, km to one decimal. */
	distanceKm: number;
	bodyStyle: string;
	cameras: string;
	power: string;
	locationMode: 'mobile' | 'workshop' | null;
	preferredWindows: Array<{ date: string; window: string }>;
	scopeSummary: string;
	priceGuide: { lowCents: number; highCents: number } | null;
	/** Live quotes so far. */
	quotes: number;
	/** The status of this installer's own quote, if any. */
	myQuote: string | null;
	postedAt: string;
}

/** Short words for the board's columns and filters. */
export const BODY_STYLE_LABELS: Record<BodyStyle, string> = {
	hatchback: 'Hatchback',
	sedan: 'Sedan',
	wagon: 'Wagon',
	suv: 'SUV',
	ute: 'Ute',
	van: 'Van',
	'people-mover': 'People mover'
};
export const CAMERA_LABELS: Record<CameraSetup, string> = {
	front: 'Front',
	'front-rear': 'Front + rear',
	'front-rear-cabin': 'Front + rear + cabin'
};
export const POWER_LABELS: Record<PowerMode, string> = {
	socket: 'Accessory socket',
	'hardwired-switched': 'Hard-wired, switched',
	'hardwired-parking': 'Hard-wired, parking mode',
	obd: 'OBD with cut-off',
	'battery-pack': 'Battery pack'
};

/** A label from one of the maps above, or the raw value when it is not in it. */
export function labelOf(labels: Record<string, string>, value: string): string {
	return labels[value] ?? value;
}

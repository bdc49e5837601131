/**
 * The fit report an installer files on the day: the circuits tapped with their fuse ratings, and a
 * checklist where every item is either done or marked "does not apply" with a reason, so nothing
 * can be skipped silently. Flat fields, so the form posts plain values and works without
 * JavaScript. Pure: the server validates with it, the install record reads it back.
 */
import { z } from 'zod';
import { FIT_FUSE_FAMILY_LABELS } from '$lib/labels';
import { BLADE_FUSE_RATINGS, type FuseFamily } from '$lib/scope/fuses';
import { CUT_OFF_VOLTS_MAX, CUT_OFF_VOLTS_MIN } from '$lib/scope/request';
import { textField } from './fields';

/**
 * The blade ratings a report may name, 1 to 30 A: the usual ISO 8820-3 blade ratings (1, 2, 3,
 * 4, 5, 7.5, 10, 15, 20, 25, 30 A; 4, 25 and 30 A from memory, see $lib/scope/fuses).
 */
export const FIT_FUSE_RATINGS = BLADE_FUSE_RATINGS.filter((r) => r.amps <= 30).map((r) =>
	String(r.amps)
) as [string, ...string[]];

export const FIT_FUSE_FAMILIES = [
	'standard',
	'mini',
	'low-profile-mini',
	'micro2',
	'micro3'
] as const satisfies readonly FuseFamily[];

/** The usual cut-off for a 12 V system (common trade practice); the form accepts what kits offer. */
export const USUAL_CUT_OFF_VOLTS = { min: 11.8, max: 12.4, source: 'common trade practice' };

/** Tapline's bounds on the time on the vehicle: below 10 minutes or above 12 hours is a typo. */
export const MINUTES_TAKEN_MIN = 10;
export const MINUTES_TAKEN_MAX = 720;
export const NOTES_MAX = 2000;
export const REASON_MAX = 200;
export const MAX_FIT_PHOTOS = 8;

/** Every item on the report; each is answered 'done' or 'na' (does not apply, with a reason). */
export const FIT_ITEMS = [
	'switchedTap',
	'permanentTap',
	'tapOrientation',
	'ground',
	'cutOff',
	'parkingMode',
	'cableHidden',
	'airbagRouting',
	'cameraPlacement',
	'rearDemister'
] as const;
export type FitItem = (typeof FIT_ITEMS)[number];

/** What each item asks, in the trade's words (the form's legend and the record's row label). */
export const FIT_ITEM_LABELS: Record<FitItem, string> = {
	switchedTap: 'Switched (ignition, ACC) supply',
	permanentTap: 'Permanent supply',
	tapOrientation: 'Fuse tap orientation checked on the supply side',
	ground: 'Ground point',
	cutOff: 'Low-voltage cut-off set',
	parkingMode: 'Parking mode checked',
	cableHidden: 'Cable hidden along the route',
	airbagRouting: 'Airbag routing respected',
	cameraPlacement: 'Camera inside the wiper sweep and clear of the mirror',
	rearDemister: 'Rear camera clear of the demister lines'
};

/** The one-line explanation shown under each item. */
export const FIT_ITEM_HINTS: Record<FitItem, string> = {
	switchedTap: 'The fuse position tapped for the supply that is live only with the ignition on.',
	permanentTap: 'The fuse position tapped for the supply that stays live with the ignition off.',
	tapOrientation:
		"The tap's original fuse sits on the supply side of the slot, so the added circuit has its own fuse and the original keeps protecting the vehicle's circuit. Checked with a test light or meter.",
	ground: 'A bolt or stud to the body, on bare metal (no paint or sealer under the ring).',
	cutOff: `The hard-wire kit's low-voltage cut-off. Usually ${USUAL_CUT_OFF_VOLTS.min}–${USUAL_CUT_OFF_VOLTS.max} V for a 12 V system (${USUAL_CUT_OFF_VOLTS.source}).`,
	parkingMode:
		'With the ignition off the camera switched to parking mode, and back to normal recording with the ignition on.',
	cableHidden: 'Tucked under trims and headlining along the whole route, nothing loose or pinched.',
	airbagRouting:
		'Where curtain airbags are fitted, the cable runs behind the airbag, never across its path or tied to it.',
	cameraPlacement:
		"Mounted inside the area the wipers sweep and out of the driver's view past the mirror.",
	rearDemister: 'The rear camera and its cable sit clear of the heated demister lines.'
};

const itemStatus = z.enum(['done', 'na']).optional();
const reason = textField()
	.trim()
	.max(REASON_MAX, { error: `Keep the reason under ${REASON_MAX} characters` })
	.optional();
const rating = z.enum(FIT_FUSE_RATINGS, { error: 'Choose a rating from the list' }).optional();
const position = textField()
	.trim()
	.max(60, { error: 'Keep the fuse position under 60 characters' })
	.optional();

const fields = {
	switchedTap: itemStatus,
	switchedTapReason: reason,
	switchedPosition: position,
	switchedOriginalAmps: rating,
	switchedAddedAmps: rating,
	permanentTap: itemStatus,
	permanentTapReason: reason,
	permanentPosition: position,
	permanentOriginalAmps: rating,
	permanentAddedAmps: rating,
	fuseFamily: z.enum(FIT_FUSE_FAMILIES, { error: 'Choose the fuse family' }).optional(),
	tapOrientation: itemStatus,
	tapOrientationReason: reason,
	ground: itemStatus,
	groundReason: reason,
	groundPoint: textField()
		.trim()
		.max(120, { error: 'Keep the ground point under 120 characters' })
		.optional(),
	groundBareMetal: z.boolean().default(false),
	cutOff: itemStatus,
	cutOffReason: reason,
	cutOffVolts: z
		.number({ error: 'Enter the cut-off voltage, e.g. 12.0' })
		.min(CUT_OFF_VOLTS_MIN, {
			error: `Kits offer a cut-off between ${CUT_OFF_VOLTS_MIN} V and ${CUT_OFF_VOLTS_MAX} V`
		})
		.max(CUT_OFF_VOLTS_MAX, {
			error: `Kits offer a cut-off between ${CUT_OFF_VOLTS_MIN} V and ${CUT_OFF_VOLTS_MAX} V`
		})
		.optional(),
	parkingMode: itemStatus,
	parkingModeReason: reason,
	cableHidden: itemStatus,
	cableHiddenReason: reason,
	airbagRouting: itemStatus,
	airbagRoutingReason: reason,
	cameraPlacement: itemStatus,
	cameraPlacementReason: reason,
	rearDemister: itemStatus,
	rearDemisterReason: reason,
	minutesTaken: z
		.number({ error: 'Enter the minutes on the vehicle' })
		.int({ error: 'Enter whole minutes' })
		.min(MINUTES_TAKEN_MIN, {
			error: `Enter between ${MINUTES_TAKEN_MIN} and ${MINUTES_TAKEN_MAX} minutes`
		})
		.max(MINUTES_TAKEN_MAX, {
			error: `Enter between ${MINUTES_TAKEN_MIN} and ${MINUTES_TAKEN_MAX} minutes`
		})
		// Optional here and required below, so an empty form shows an empty field, not 0.
		.optional(),
	notes: textField()
		.trim()
		.max(NOTES_MAX, {
			error: `Keep the notes under ${NOTES_MAX.toLocaleString('en-AU')} characters`
		})
		.optional()
};

type Raw = z.output<z.ZodObject<typeof fields>>;

/** The items a job asks about: the rear demister line only when a rear camera is fitted. */
export function itemsFor(rearCamera: boolean): FitItem[] {
	return FIT_ITEMS.filter((item) => rearCamera || item !== 'rearDemister');
}

function checkReport(data: Raw, ctx: z.RefinementCtx, rearCamera: boolean) {
	const problem = (path: keyof Raw, message: string) =>
		ctx.addIssue({ code: 'custom', path: [path], message });
	for (const item of itemsFor(rearCamera)) {
		const status = data[item];
		if (!status) {
			problem(item, 'Tick this, or mark it "does not apply" and say why');
		} else if (status === 'na' && (data[`${item}Reason`]?.length ?? 0) < 3) {
			problem(`${item}Reason`, 'Say why this does not apply');
		}
	}
	for (const side of ['switched', 'permanent'] as const) {
		if (data[`${side}Tap`] !== 'done') continue;
		if (!data[`${side}Position`]) problem(`${side}Position`, 'Enter the fuse position tapped');
		const original = data[`${side}OriginalAmps`];
		const added = data[`${side}AddedAmps`];
		if (!original) problem(`${side}OriginalAmps`, "Choose the original fuse's rating");
		if (!added) problem(`${side}AddedAmps`, "Choose the added circuit's fuse rating");
		// The added fuse never exceeds the fuse of the circuit it taps (common trade practice).
		if (original && added && Number(added) > Number(original)) {
			problem(
				`${side}AddedAmps`,
				`The added circuit's fuse cannot be larger than the original ${original} A fuse`
			);
		}
	}
	if ((data.switchedTap === 'done' || data.permanentTap === 'done') && !data.fuseFamily) {
		problem('fuseFamily', 'Choose the fuse family of the taps');
	}
	if (data.ground === 'done') {
		if (!data.groundPoint) problem('groundPoint', 'Say where the ground is bolted');
		if (!data.groundBareMetal) problem('groundBareMetal', 'Ground only to bare metal');
	}
	if (data.minutesTaken === undefined) problem('minutesTaken', 'Enter the minutes on the vehicle');
	if (data.cutOff === 'done' && data.cutOffVolts === undefined) {
		problem('cutOffVolts', 'Enter the cut-off voltage, e.g. 12.0');
	}
}

/** The report for a job with a front camera only (no rear demister item). */
export const fitReportSchema = z
	.object(fields)
	.superRefine((data, ctx) => checkReport(data, ctx, false));
/** The report for a job with a rear camera. */
export const fitReportRearSchema = z
	.object(fields)
	.superRefine((data, ctx) => checkReport(data, ctx, true));

export type FitReportForm = z.output<typeof fitReportSchema>;

/** The schema for a job, by whether it has a rear camera. */
export const fitReportSchemaFor = (rearCamera: boolean) =>
	rearCamera ? fitReportRearSchema : fitReportSchema;

export type ItemAnswer = { done: true } | { done: false; reason: string };
export interface TapRecord {
	position: string;
	originalAmps: number;
	addedAmps: number;
}

/** What is stored in `fit_report.details`: only the answers that apply, in a stable shape. */
export interface FitReportDetails {
	version: 1;
	items: Partial<Record<FitItem, ItemAnswer>>;
	fuseFamily: FuseFamily | null;
	switched: TapRecord | null;
	permanent: TapRecord | null;
	ground: { point: string } | null;
	cutOffVolts: number | null;
}

/**
 * The stored details of a validated report: answers for the job's items only, taps and the ground
 * only when done, so an answer typed and then marked "does not apply" is not kept.
 */
export function toFitReportDetails(form: FitReportForm, rearCamera: boolean): FitReportDetails {
	const items: FitReportDetails['items'] = {};
	for (const item of itemsFor(rearCamera)) {
		items[item] =
			form[item] === 'done' ? { done: true } : { done: false, reason: form[`${item}Reason`] ?? '' };
	}
	const tap = (side: 'switched' | 'permanent'): TapRecord | null =>
		form[`${side}Tap`] === 'done'
			? {
					position: form[`${side}Position`] ?? '',
					originalAmps: Number(form[`${side}OriginalAmps`]),
					addedAmps: Number(form[`${side}AddedAmps`])
				}
			: null;
	const switched = tap('switched');
	const permanent = tap('permanent');
	return {
		version: 1,
		items,
		fuseFamily: switched || permanent ? (form.fuseFamily ?? null) : null,
		switched,
		permanent,
		ground: form.ground === 'done' ? { point: form.groundPoint ?? '' } : null,
		cutOffVolts: form.cutOff === 'done' ? (form.cutOffVolts ?? null) : null
	};
}

const amps = (n: number) => `${String(n)} A`;

/** The report as rows of words, for the install record page and its PDF. */
export function describeFitReport(details: FitReportDetails): { label: string; value: string }[] {
	const rows: { label: string; value: string }[] = [];
	for (const item of FIT_ITEMS) {
		const answer = details.items[item];
		if (!answer) continue;
		let value: string;
		if (!answer.done) {
			value = `Does not apply: ${answer.reason}`;
		} else if (item === 'switchedTap' || item === 'permanentTap') {
			const tap = item === 'switchedTap' ? details.switched : details.permanent;
			value = tap
				? `Fuse ${tap.position}: original ${amps(tap.originalAmps)}, added circuit ${amps(tap.addedAmps)}${details.fuseFamily ? ` (${FIT_FUSE_FAMILY_LABELS[details.fuseFamily].toLowerCase()})` : ''}`
				: 'Done';
		} else if (item === 'ground') {
			value = `${details.ground?.point ?? ''}, on bare metal`;
		} else if (item === 'cutOff') {
			value = details.cutOffVolts === null ? 'Set' : `${details.cutOffVolts.toFixed(1)} V`;
		} else {
			value = 'Checked';
		}
		rows.push({ label: FIT_ITEM_LABELS[item], value });
	}
	return rows;
}

/** A problem with the number of photos, or null (at least one of the finished fit; at most 8). */
export function photoCountProblem(count: number): string | null {
	if (count < 1) return 'Add at least one photo of the finished fit';
	if (count > MAX_FIT_PHOTOS) return `Add at most ${String(MAX_FIT_PHOTOS)} photos`;
	return null;
}

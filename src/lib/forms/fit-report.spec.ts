import { describe, expect, it } from 'vitest';
import {
	FIT_FUSE_RATINGS,
	describeFitReport,
	fitReportRearSchema,
	fitReportSchema,
	photoCountProblem,
	toFitReportDetails
} from './fit-report';

/** A complete report of a parking-mode fit with a rear camera. */
const FULL = {
	switchedTap: 'done',
	switchedPosition: 'F12 cabin box',
	switchedOriginalAmps: '10',
	switchedAddedAmps: '5',
	permanentTap: 'done',
	permanentPosition: 'F30 cabin box',
	permanentOriginalAmps: '15',
	permanentAddedAmps: '5',
	fuseFamily: 'mini',
	tapOrientation: 'done',
	ground: 'done',
	groundPoint: 'Kick-panel stud, passenger side',
	groundBareMetal: true,
	cutOff: 'done',
	cutOffVolts: 12.0,
	parkingMode: 'done',
	cableHidden: 'done',
	airbagRouting: 'done',
	cameraPlacement: 'done',
	rearDemister: 'done',
	minutesTaken: 95,
	notes: 'Rear cable through the tailgate boot.'
};

const messagesAt = (result: { error?: { issues: { path: PropertyKey[]; message: string }[] } }) =>
	Object.fromEntries((result.error?.issues ?? []).map((i) => [String(i.path[0]), i.message]));

describe('fit report schema', () => {
	it('takes a complete report', () => {
		expect(fitReportRearSchema.safeParse(FULL).success).toBe(true);
	});

	it('refuses a report with a required item left out, at that item', () => {
		for (const item of ['tapOrientation', 'ground', 'cableHidden', 'cameraPlacement'] as const) {
			const rest: Record<string, unknown> = { ...FULL };
			delete rest[item];
			expect(messagesAt(fitReportRearSchema.safeParse(rest))[item]).toBe(
				'Tick this, or mark it "does not apply" and say why'
			);
		}
	});

	it('needs a reason for an item that does not apply', () => {
		const bare = { ...FULL, parkingMode: 'na' };
		expect(messagesAt(fitReportRearSchema.safeParse(bare)).parkingModeReason).toBe(
			'Say why this does not apply'
		);
		const withReason = { ...bare, parkingModeReason: 'Switched supply only, no parking mode' };
		expect(fitReportRearSchema.safeParse(withReason).success).toBe(true);
	});

	it('asks about the rear demister only when a rear camera is fitted', () => {
		const frontOnly: Record<string, unknown> = { ...FULL };
		delete frontOnly.rearDemister;
		expect(fitReportSchema.safeParse(frontOnly).success).toBe(true);
		expect(messagesAt(fitReportRearSchema.safeParse(frontOnly)).rearDemister).toBeDefined();
		const parsed = fitReportSchema.parse({ ...FULL });
		expect(toFitReportDetails(parsed, false).items.rearDemister).toBeUndefined();
		expect(toFitReportDetails(parsed, true).items.rearDemister).toEqual({ done: true });
	});

	it('takes ratings only from the blade list (ISO 8820-3 ratings 1–30 A)', () => {
		expect(FIT_FUSE_RATINGS).toEqual([
			'1',
			'2',
			'3',
			'4',
			'5',
			'7.5',
			'10',
			'15',
			'20',
			'25',
			'30'
		]);
		const odd = fitReportRearSchema.safeParse({ ...FULL, switchedAddedAmps: '6' });
		expect(messagesAt(odd).switchedAddedAmps).toBe('Choose a rating from the list');
	});

	it('refuses an added fuse larger than the fuse of the tapped circuit (common trade practice)', () => {
		const big = fitReportRearSchema.safeParse({ ...FULL, switchedAddedAmps: '15' });
		expect(messagesAt(big).switchedAddedAmps).toBe(
			"The added circuit's fuse cannot be larger than the original 10 A fuse"
		);
	});

	it('needs the tap details, the fuse family and a bare-metal ground when they are done', () => {
		const result = fitReportRearSchema.safeParse({
			...FULL,
			switchedPosition: '',
			fuseFamily: undefined,
			groundBareMetal: false,
			cutOffVolts: undefined
		});
		expect(messagesAt(result)).toMatchObject({
			switchedPosition: 'Enter the fuse position tapped',
			fuseFamily: 'Choose the fuse family of the taps',
			groundBareMetal: 'Ground only to bare metal',
			cutOffVolts: 'Enter the cut-off voltage, e.g. 12.0'
		});
	});

	it('bounds the cut-off to what kits offer (kit listings, 11.6–12.5 V) and the minutes', () => {
		expect(
			messagesAt(fitReportRearSchema.safeParse({ ...FULL, cutOffVolts: 10.5 })).cutOffVolts
		).toBe('Kits offer a cut-off between 11.6 V and 12.5 V');
		expect(
			messagesAt(fitReportRearSchema.safeParse({ ...FULL, minutesTaken: 5 })).minutesTaken
		).toBe('Enter between 10 and 720 minutes');
		expect(fitReportRearSchema.safeParse({ ...FULL, minutesTaken: 90.5 }).success).toBe(false);
		const noMinutes = fitReportRearSchema.safeParse({ ...FULL, minutesTaken: undefined });
		expect(messagesAt(noMinutes).minutesTaken).toBe('Enter the minutes on the vehicle');
	});
});

describe('stored details and the record rows', () => {
	it('keeps only answers that apply and words them for the record', () => {
		const parsed = fitReportSchema.parse({
			...FULL,
			permanentTap: 'na',
			permanentTapReason: 'Switched supply only',
			cutOff: 'na',
			cutOffReason: 'No parking mode'
		});
		const details = toFitReportDetails(parsed, false);
		expect(details.permanent).toBeNull();
		expect(details.cutOffVolts).toBeNull();
		expect(details.switched).toEqual({ position: 'F12 cabin box', originalAmps: 10, addedAmps: 5 });
		const rows = describeFitReport(details);
		expect(rows[0]).toEqual({
			label: 'Switched (ignition, ACC) supply',
			value: 'Fuse F12 cabin box: original 10 A, added circuit 5 A (mini blade)'
		});
		expect(rows).toContainEqual({
			label: 'Permanent supply',
			value: 'Does not apply: Switched supply only'
		});
		expect(rows).toContainEqual({
			label: 'Ground point',
			value: 'Kick-panel stud, passenger side, on bare metal'
		});
		expect(rows.some((r) => r.label.startsWith('Rear camera'))).toBe(false);
	});

	it('wants one to eight photos', () => {
		expect(photoCountProblem(0)).toBe('Add at least one photo of the finished fit');
		expect(photoCountProblem(1)).toBeNull();
		expect(photoCountProblem(8)).toBeNull();
		expect(photoCountProblem(9)).toBe('Add at most 8 photos');
	});
});

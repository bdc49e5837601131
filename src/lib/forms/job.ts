/**
 * The owner's job request, one step at a time. Each step validates its own slice of
 * `jobRequestSchema` (so messages appear where the owner is typing) and the whole request is
 * validated again on posting.
 */
import { z } from 'zod';
import { textField } from './fields';
import { jobRequestSchema } from '$lib/scope/request';

export const JOB_STEPS = [
	{ slug: 'vehicle', label: 'Vehicle' },
	{ slug: 'cameras', label: 'Cameras' },
	{ slug: 'power', label: 'Power' },
	{ slug: 'place', label: 'Where and when' },
	{ slug: 'photos', label: 'Photos' },
	{ slug: 'review', label: 'Review' }
] as const;
export type JobStep = (typeof JOB_STEPS)[number]['slug'];

/** The step after this one. */
export const nextStep = (step: JobStep): JobStep => {
	const i = JOB_STEPS.findIndex((s) => s.slug === step);
	return JOB_STEPS[Math.min(i + 1, JOB_STEPS.length - 1)]!.slug;
};

const f = jobRequestSchema.shape;

/**
 * A required choice with no preselected answer: superforms would otherwise fill an enum with its
 * first option, and the owner might post "hatchback" or "no airbags" without having said so.
 */
function choose<T extends z.ZodType>(schema: T, message: string) {
	return schema.optional().refine((v) => v !== undefined, { message });
}

export const vehicleStepSchema = z.object({
	make: f.make,
	model: f.model,
	year: f.year,
	bodyStyle: choose(f.bodyStyle, 'Choose a body style'),
	fuseFamily: choose(f.fuseFamily, "Choose the fuse type, or 'not sure'"),
	batteryType: choose(f.batteryType, "Choose the battery type, or 'not sure'"),
	batteryAh: f.batteryAh,
	startStop: f.startStop,
	hybridOrEv: f.hybridOrEv,
	curtainAirbags: choose(f.curtainAirbags, "Say whether the car has curtain airbags, or 'not sure'")
});

export const camerasStepSchema = z
	.object({
		cameras: choose(f.cameras, 'Choose which cameras to fit'),
		cameraSupply: choose(f.cameraSupply, 'Say who supplies the camera'),
		/** Whole dollars in the form; stored as cents. */
		cameraBudgetDollars: z
			.number({ error: 'Enter a budget in whole dollars' })
			.int({ error: 'Enter a budget in whole dollars' })
			.min(50, { error: 'A camera budget starts at $50' })
			.max(5000, { error: 'Keep the camera budget under $5,000' })
			.optional(),
		removeOldUnit: f.removeOldUnit
	})
	.refine((v) => v.cameraSupply !== 'installer' || v.cameraBudgetDollars !== undefined, {
		path: ['cameraBudgetDollars'],
		message: 'Enter a budget for the camera the installer supplies'
	});

export const powerStepSchema = z.object({
	power: choose(f.power, 'Choose how the camera is powered'),
	parkingDrawMilliamps: f.parkingDrawMilliamps,
	cutOffVolts: f.cutOffVolts,
	restVolts: f.restVolts
});

export const TIME_WINDOWS = {
	morning: { label: 'Morning (8 am – 12 pm)', start: '08:00', end: '12:00' },
	midday: { label: 'Middle of the day (11 am – 2 pm)', start: '11:00', end: '14:00' },
	afternoon: { label: 'Afternoon (1 pm – 5 pm)', start: '13:00', end: '17:00' }
} as const;
export type TimeWindow = keyof typeof TIME_WINDOWS;
const windowKeys = Object.keys(TIME_WINDOWS) as [TimeWindow, ...TimeWindow[]];

// zod's ISO date knows month lengths and leap years: 30 February is refused, not rolled over.
const isoDate = z.iso
	.date({ error: 'Choose a date that exists on the calendar' })
	.optional()
	.or(z.literal('').transform(() => undefined));

export const placeStepSchema = z
	.object({
		locationMode: choose(
			z.enum(['mobile', 'workshop']),
			"Choose 'at my place' or 'at the installer's workshop'"
		),
		place: textField({ error: 'Enter your suburb or postcode' })
			.trim()
			.min(2, { error: 'Enter your suburb or postcode' })
			.max(60, { error: 'Keep the suburb under 60 characters' }),
		latitude: z.number().min(-90).max(90).optional(),
		longitude: z.number().min(-180).max(180).optional(),
		addressLine: textField()
			.trim()
			.max(120, { error: 'Keep the street address under 120 characters' })
			.optional(),
		date1: isoDate,
		window1: z.enum(windowKeys).default('morning'),
		date2: isoDate,
		window2: z.enum(windowKeys).default('morning'),
		date3: isoDate,
		window3: z.enum(windowKeys).default('morning')
	})
	.refine((v) => v.date1 || v.date2 || v.date3, {
		path: ['date1'],
		message: 'Choose at least one date that suits you'
	})
	.refine((v) => v.locationMode !== 'mobile' || (v.addressLine?.length ?? 0) >= 5, {
		path: ['addressLine'],
		message:
			'For a fit at your place, enter the street address (installers see it only once booked)'
	});

/** The longest note an owner leaves installers on a posted job. */
export const MAX_OWNER_NOTE_LENGTH = 500;

/**
 * What an owner may still change once installers have quoted: the dates that suit them and a
 * note to installers. The car, cameras, power and place are what the quotes priced, so they stay.
 */
export const adjustJobSchema = z
	.object({
		date1: isoDate,
		window1: z.enum(windowKeys).default('morning'),
		date2: isoDate,
		window2: z.enum(windowKeys).default('morning'),
		date3: isoDate,
		window3: z.enum(windowKeys).default('morning'),
		note: textField()
			.trim()
			.max(MAX_OWNER_NOTE_LENGTH, {
				error: `Keep the note under ${String(MAX_OWNER_NOTE_LENGTH)} characters`
			})
			.default('')
	})
	.refine((v) => v.date1 || v.date2 || v.date3, {
		path: ['date1'],
		message: 'Choose at least one date that suits you'
	});

/** The chosen dates of a dates form, in order, without the empty rows. */
export function chosenWindows(d: {
	date1?: string;
	window1: TimeWindow;
	date2?: string;
	window2: TimeWindow;
	date3?: string;
	window3: TimeWindow;
}): Array<{ date: string; window: TimeWindow }> {
	return (
		[
			[d.date1, d.window1],
			[d.date2, d.window2],
			[d.date3, d.window3]
		] as const
	)
		.filter((w): w is readonly [string, TimeWindow] => Boolean(w[0]))
		.map(([date, window]) => ({ date, window }));
}

export const withdrawSchema = z.object({
	reason: textField({ error: 'Tell installers why, in a few words' })
		.trim()
		.min(5, { error: 'Tell installers why, in a few words (at least 5 characters)' })
		.max(300, { error: 'Keep the reason under 300 characters' }),
	// A boolean, not literal(true): superforms would default a literal to its value and so tick the
	// box on the owner's behalf.
	confirm: z
		.boolean()
		.default(false)
		.refine((v) => v, { message: 'Tick the box to confirm: this cannot be undone' })
});

export const PHOTO_KINDS = {
	'fuse-box': 'Cabin fuse box (cover off, fuse map visible if you can)',
	windscreen: 'Windscreen from inside, around the mirror',
	'rear-window': 'Rear window and tailgate or boot lid'
} as const;
export type PhotoKind = keyof typeof PHOTO_KINDS;
export const photoKindSchema = z.enum(Object.keys(PHOTO_KINDS) as [PhotoKind, ...PhotoKind[]], {
	error: 'Say which photo this is'
});

/** How far ahead an owner may ask for a fit. */
export const MAX_DAYS_AHEAD = 90;

/**
 * Why a preferred date cannot be used, or null. Dates are local calendar dates in the job's time
 * zone (`today` likewise), compared as ISO strings: tomorrow up to MAX_DAYS_AHEAD days ahead.
 */
export function preferredDateProblem(date: string, today: string): string | null {
	const day = Date.parse(`${date}T00:00:00Z`);
	const base = Date.parse(`${today}T00:00:00Z`);
	if (Number.isNaN(day)) return 'Choose a real date';
	const ahead = Math.round((day - base) / 86_400_000);
	if (ahead < 1) return 'Choose a date after today';
	if (ahead > MAX_DAYS_AHEAD) return `Choose a date within ${MAX_DAYS_AHEAD} days`;
	return null;
}

/**
 * What an owner tells us about the job. The schema is flat (no nested `vehicle` object) so the
 * form posts plain fields and works without JavaScript.
 */
import { z } from 'zod';
import { textField } from '$lib/forms/fields';

export const BODY_STYLES = [
	'hatchback',
	'sedan',
	'wagon',
	'suv',
	'ute',
	'van',
	'people-mover'
] as const;
export type BodyStyle = (typeof BODY_STYLES)[number];

export const FUSE_FAMILY_ANSWERS = [
	'standard',
	'mini',
	'low-profile-mini',
	'micro2',
	'micro3',
	'unknown'
] as const;
export type FuseFamilyAnswer = (typeof FUSE_FAMILY_ANSWERS)[number];

/** 'lithium': a 12 V lithium starter battery (some recent cars, EVs especially). */
export const BATTERY_TYPES = ['flooded', 'efb', 'agm', 'lithium', 'unknown'] as const;
export type BatteryType = (typeof BATTERY_TYPES)[number];

export const CURTAIN_AIRBAG_ANSWERS = ['yes', 'no', 'unknown'] as const;
export type CurtainAirbagAnswer = (typeof CURTAIN_AIRBAG_ANSWERS)[number];

export const CAMERA_SETUPS = ['front', 'front-rear', 'front-rear-cabin'] as const;
export type CameraSetup = (typeof CAMERA_SETUPS)[number];

export const CAMERA_SUPPLIES = ['owner', 'installer'] as const;
export type CameraSupply = (typeof CAMERA_SUPPLIES)[number];

export const POWER_MODES = [
	'socket',
	'hardwired-switched',
	'hardwired-parking',
	'obd',
	'battery-pack'
] as const;
export type PowerMode = (typeof POWER_MODES)[number];

/** Cut-off voltages hard-wire kits offer (published: kit listings, 11.6–12.5 V). */
export const CUT_OFF_VOLTS_MIN = 11.6;
export const CUT_OFF_VOLTS_MAX = 12.5;

/**
 * What a rested 12 V car battery can read (Tapline's bounds): below 10.5 V a lead-acid battery
 * is flat and damaged or has a dead cell (from memory: 10.5 V is the usual end of discharge);
 * above 13.5 V the reading is a charger or running engine, not a battery at rest.
 */
export const REST_VOLTS_MIN = 10.5;
export const REST_VOLTS_MAX = 13.5;

const requiredText = (field: string, max: number) =>
	textField({ error: `Enter the ${field}` })
		.trim()
		.min(1, { error: `Enter the ${field}` })
		.max(max, { error: `Keep the ${field} under ${max} characters` });

export const jobRequestSchema = z
	.object({
		make: requiredText('make', 40),
		model: requiredText('model', 60),
		year: textField({ error: 'Enter the year' })
			.trim()
			.regex(/^(19|20)\d{2}$/, { error: 'Enter a year from 1900 to 2099, e.g. 2018' }),
		bodyStyle: z.enum(BODY_STYLES, { error: 'Choose a body style' }),
		fuseFamily: z.enum(FUSE_FAMILY_ANSWERS, {
			error: "Choose the fuse type, or 'not sure'"
		}),
		batteryType: z.enum(BATTERY_TYPES, { error: "Choose the battery type, or 'not sure'" }),
		batteryAh: z
			.number({ error: 'Enter the battery capacity in amp-hours' })
			.int({ error: 'Enter the battery capacity in whole amp-hours' })
			// Car starter batteries sit well inside this (common trade practice); outside it is a typo.
			.min(20, { error: 'Battery capacity is usually between 20 and 200 Ah' })
			.max(200, { error: 'Battery capacity is usually between 20 and 200 Ah' })
			.optional(),
		startStop: z.boolean({ error: 'Say whether the car has engine start-stop' }).default(false),
		hybridOrEv: z.boolean({ error: 'Say whether the car is a hybrid or EV' }).default(false),
		curtainAirbags: z.enum(CURTAIN_AIRBAG_ANSWERS, {
			error: "Say whether the car has curtain airbags, or 'not sure'"
		}),
		cameras: z.enum(CAMERA_SETUPS, { error: 'Choose which cameras to fit' }),
		cameraSupply: z.enum(CAMERA_SUPPLIES, { error: 'Say who supplies the camera' }),
		cameraBudgetCents: z
			.number({ error: 'Enter a budget for the camera' })
			.int({ error: 'Enter the budget in whole cents' })
			.positive({ error: 'Enter a budget for the camera' })
			.optional(),
		power: z.enum(POWER_MODES, { error: 'Choose how the camera is powered' }),
		parkingDrawMilliamps: z
			.number({ error: 'Enter the parking draw in milliamps' })
			.int({ error: 'Enter the parking draw in whole milliamps' })
			.min(5, { error: 'Parking draw is usually between 5 and 2000 mA' })
			.max(2000, { error: 'Parking draw is usually between 5 and 2000 mA' })
			.optional(),
		cutOffVolts: z
			.number({ error: 'Enter the cut-off voltage' })
			.min(CUT_OFF_VOLTS_MIN, {
				error: `Choose a cut-off between ${CUT_OFF_VOLTS_MIN} V and ${CUT_OFF_VOLTS_MAX} V`
			})
			.max(CUT_OFF_VOLTS_MAX, {
				error: `Choose a cut-off between ${CUT_OFF_VOLTS_MIN} V and ${CUT_OFF_VOLTS_MAX} V`
			})
			.optional(),
		restVolts: z
			.number({ error: 'Enter the voltage you measured, e.g. 12.4' })
			.min(REST_VOLTS_MIN, {
				error: `A rested 12 V battery reads between ${REST_VOLTS_MIN} V and ${REST_VOLTS_MAX} V; check the reading`
			})
			.max(REST_VOLTS_MAX, {
				error: `A rested 12 V battery reads between ${REST_VOLTS_MIN} V and ${REST_VOLTS_MAX} V; above that is a charger or a running engine`
			})
			.optional(),
		removeOldUnit: z.boolean({ error: 'Say whether an old unit comes out' }).default(false)
	})
	.refine((job) => job.cameraSupply !== 'installer' || job.cameraBudgetCents !== undefined, {
		error: 'Enter a budget for the camera the installer supplies',
		path: ['cameraBudgetCents']
	});

/** A validated job request: what `computeScope` takes. */
export type JobRequestInput = z.output<typeof jobRequestSchema>;

/** What a form may post before defaults are filled in. */
export type JobRequestFormData = z.input<typeof jobRequestSchema>;

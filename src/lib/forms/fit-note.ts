/**
 * A fit note as the installer writes it after a fit, and a mark another installer puts on it.
 * Free text refuses contact details, addresses and plates ($lib/fit-notes/fit-notes privateDetailProblem),
 * so nothing about the owner is stored.
 */
import { z } from 'zod';
import { BODY_STYLES } from '$lib/scope/request';
import { FIRST_MODEL_YEAR, LAST_MODEL_YEAR, privateDetailProblem } from '$lib/fit-notes/fit-notes';
import { textField } from './fields';

/** Fuse families a note may name (the ones $lib/scope/fuses knows). */
export const NOTE_FUSE_FAMILIES = [
	'standard',
	'mini',
	'low-profile-mini',
	'micro2',
	'micro3'
] as const;

/** Blade fuse ratings run 1–40 A (from memory; see $lib/scope/fuses). */
const MAX_FUSE_AMPS = 40;

const vehicleOnly = (s: string) => privateDetailProblem(s) === null;
const note = (what: string, max: number) =>
	textField({ error: `Describe the ${what}` })
		.trim()
		.min(1, { error: `Describe the ${what}` })
		.max(max, { error: `Keep the ${what} under ${String(max)} characters` })
		.refine(vehicleOnly, { error: (i) => privateDetailProblem(String(i.input)) ?? '' });
const optionalNote = (what: string, max: number) =>
	textField()
		.trim()
		.max(max, { error: `Keep the ${what} under ${String(max)} characters` })
		.refine(vehicleOnly, { error: (i) => privateDetailProblem(String(i.input)) ?? '' })
		.default('');
const year = (which: string) =>
	z
		.number({ error: `Enter the ${which} model year` })
		.int({ error: `Enter the ${which} model year, e.g. 2017` })
		.min(FIRST_MODEL_YEAR, { error: `Enter a year from ${String(FIRST_MODEL_YEAR)}` })
		.max(LAST_MODEL_YEAR, { error: `Enter a year up to ${String(LAST_MODEL_YEAR)}` });
const amps = (which: string) =>
	z
		.number({ error: `Enter the ${which} fuse's rating in amps` })
		.int({ error: 'Enter whole amps, e.g. 10' })
		.min(1, { error: `Blade fuses run from 1 to ${String(MAX_FUSE_AMPS)} A` })
		.max(MAX_FUSE_AMPS, { error: `Blade fuses run from 1 to ${String(MAX_FUSE_AMPS)} A` });

export const fitNoteSchema = z
	.object({
		make: note('make', 40),
		model: note('model', 60),
		yearFrom: year('first'),
		yearTo: year('last'),
		bodyStyle: z.enum(BODY_STYLES, { error: 'Choose a body style' }),
		fuseFamily: z.enum(NOTE_FUSE_FAMILIES, { error: 'Choose the fuse family' }),
		fuseBoxLocation: note('fuse box location', 300),
		fuseBoxAccess: note('way the fuse box opens', 300),
		switchedFuse: note('switched supply position', 100),
		switchedRatingAmps: amps('switched'),
		permanentFuse: optionalNote('permanent supply position', 100),
		permanentRatingAmps: amps('permanent').optional(),
		groundPoints: note('ground points', 500),
		trimRemoval: note('trim removal', 1000),
		grommetRoute: optionalNote('grommet route', 500),
		pitfalls: optionalNote('pitfalls', 1000)
	})
	.refine((n) => n.yearFrom <= n.yearTo, {
		error: 'The last year cannot be before the first',
		path: ['yearTo']
	})
	.refine((n) => (n.permanentFuse === '') === (n.permanentRatingAmps === undefined), {
		error: 'Give the permanent supply position and its rating together, or neither',
		path: ['permanentRatingAmps']
	});
export type FitNoteInput = z.output<typeof fitNoteSchema>;

export const FIT_NOTE_VERDICTS = ['confirmed', 'wrong'] as const;
export type FitNoteVerdict = (typeof FIT_NOTE_VERDICTS)[number];

export const fitNoteMarkSchema = z.object({
	verdict: z.enum(FIT_NOTE_VERDICTS, { error: 'Say whether it held on your fit' }),
	comment: textField({ error: 'Say what you found' })
		.trim()
		.min(1, { error: 'Say what you found on your fit' })
		.max(1000, { error: 'Keep the comment under 1000 characters' })
		.refine(vehicleOnly, { error: (i) => privateDetailProblem(String(i.input)) ?? '' })
});
export type FitNoteMarkInput = z.output<typeof fitNoteMarkSchema>;

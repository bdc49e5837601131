import { z } from 'zod';
import { textField } from './fields';
import { abnSchema } from '$lib/people/abn';
import { ADMIN_DECISIONS, INSTALLER_SKILLS, VETTING_STATUSES } from '$lib/people/vetting';

/**
 * Australian phone numbers: 10 digits starting 02, 03, 04, 07 or 08, or +61 and the same number
 * without its leading 0 (ACMA numbering plan; from memory). Spaces and brackets are ignored.
 */
const PHONE_RE = /^(?:0|\+61)[23478]\d{8}$/;

const text = (min: number, max: number, missing: string) =>
	textField({ error: missing })
		.trim()
		.min(min, missing)
		.max(max, `Keep this under ${max} characters`);

export const applicationSchema = z
	.object({
		businessName: text(2, 100, 'Enter your business or trading name'),
		contactName: text(2, 80, 'Enter the name of the person we deal with'),
		phone: textField({ error: 'Enter a phone number' })
			.transform((v) => v.replace(/[\s()-]/g, ''))
			.pipe(z.string().regex(PHONE_RE, 'Enter an Australian number, e.g. 0412 345 678')),
		abn: abnSchema,
		// No answer preselected (superforms would fill an enum with its first option): the
		// installer says it, since quotes carry GST only when they are registered.
		gstRegistered: z
			.enum(['yes', 'no'])
			.optional()
			.refine((v) => v !== undefined, {
				message: 'Say whether you are registered for GST'
			}),
		yearsInTrade: z
			.number({ error: 'Enter a number of years' })
			.int('Whole years, please')
			.min(0, 'Enter 0 if you are just starting')
			.max(60, 'Enter at most 60 years'),
		skills: z
			.array(z.enum(INSTALLER_SKILLS))
			.min(1, 'Tick at least one kind of fit you do')
			.default([]),
		workMode: z.enum(['mobile', 'workshop', 'both'], {
			error: 'Choose whether you travel, have a workshop, or both'
		}),
		workshopAddress: textField()
			.trim()
			.max(200, 'Keep the address under 200 characters')
			.default(''),
		baseSuburb: text(2, 60, 'Enter the suburb or postcode you work from')
	})
	.refine((v) => v.workMode === 'mobile' || v.workshopAddress.length >= 5, {
		path: ['workshopAddress'],
		message: 'Enter the workshop’s street address'
	});

/**
 * Public liability policies run for a year, a few for longer (common trade practice): an expiry
 * date more than a year past cannot be on a current certificate, and one more than five years
 * ahead is a typo. Both are refused where they are typed.
 */
export const INSURANCE_EXPIRY_PAST_DAYS = 366;
export const INSURANCE_EXPIRY_FUTURE_DAYS = 5 * 366;

/** The UTC calendar date `days` from now (negative for the past), as YYYY-MM-DD. */
const isoDateDaysFrom = (days: number) =>
	new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

export const insuranceSchema = z.object({
	insurer: text(2, 100, 'Enter the insurer’s name'),
	policyNumber: text(3, 40, 'Enter the policy number from the certificate'),
	coverDollars: z
		.number({ error: 'Enter the cover in whole dollars' })
		.int('Whole dollars, please')
		.min(1, 'Enter the cover in whole dollars')
		.max(1_000_000_000, 'That is more cover than we can record'),
	expiresOn: z.iso
		.date({ error: 'Enter the expiry date from the certificate' })
		.refine((v) => v >= isoDateDaysFrom(-INSURANCE_EXPIRY_PAST_DAYS), {
			error: 'That date is more than a year ago. Enter the expiry date on your current certificate.'
		})
		.refine((v) => v <= isoDateDaysFrom(INSURANCE_EXPIRY_FUTURE_DAYS), {
			error: 'That date is more than five years away. Check the expiry date on the certificate.'
		})
});

export const serviceAreaSchema = z
	.object({
		// Mainland Australia and Tasmania lie within about 10–44° S and 112–154° E (from memory).
		latitude: z.number({ error: 'Place the pin on the map' }).min(-44).max(-10),
		longitude: z.number({ error: 'Place the pin on the map' }).min(112).max(154),
		serviceRadiusKm: z
			.number({ error: 'Enter how far you travel' })
			.int('Whole kilometres, please')
			.min(1, 'At least 1 km')
			.max(200, 'At most 200 km'),
		freeRadiusKm: z.number().int('Whole kilometres, please').min(0).max(200).default(0),
		travelFeeDollarsPerKm: z
			.number()
			.min(0, 'The fee cannot be negative')
			.max(20, 'At most $20 a kilometre')
			.default(0)
	})
	.refine((v) => v.freeRadiusKm <= v.serviceRadiusKm, {
		path: ['freeRadiusKm'],
		message: 'The free distance cannot be more than the distance you travel'
	});

const time = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$/, 'Use a 24-hour time like 08:30');

/** Row order of the hours form, Monday first as Australian diaries show a week (0 = Sunday). */
export const HOURS_FORM_ORDER = [1, 2, 3, 4, 5, 6, 0] as const;

/**
 * One block a day: the weekdays ticked, and a start and finish for each row of the form, in
 * {@link HOURS_FORM_ORDER} (the order the inputs post in, with or without JavaScript).
 */
export const weeklyHoursSchema = z.object({
	days: z.array(z.number().int().min(0).max(6)).default([]),
	// No defaults: the page always sends a start and an end for each of the seven days, so a post
	// without them (an empty or unreadable body) is refused instead of saving "no working days".
	start: z.array(time).length(7, 'Give a start and an end time for each day'),
	end: z.array(time).length(7, 'Give a start and an end time for each day')
});

export const blockedDateSchema = z.object({
	day: z.iso.date({ error: 'Choose a date' }),
	note: textField().trim().max(100, 'Keep the note under 100 characters').default('')
});

export const decisionSchema = z.object({
	decision: z.enum(ADMIN_DECISIONS, { error: 'Choose a decision' }),
	expectedStatus: z.enum(VETTING_STATUSES),
	message: textField().trim().max(1000, 'Keep it under 1000 characters').default(''),
	identityMatches: z.boolean().default(false),
	insuranceCurrent: z.boolean().default(false),
	abnValidAndActive: z.boolean().default(false)
});

/**
 * A generated matrix over every form schema: each field that takes free text must refuse a NUL
 * character (PostgreSQL cannot store one, so it would otherwise end in a 500), and each date
 * field must refuse a day that does not exist. New schemas and fields join the matrix by being
 * exported from these modules.
 */
import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import * as accountForms from '$lib/forms/account';
import * as authForms from '$lib/forms/auth';
import { NUL_MESSAGE } from '$lib/forms/fields';
import * as fitNoteForms from '$lib/forms/fit-note';
import * as fitReportForms from '$lib/forms/fit-report';
import * as jobForms from '$lib/forms/job';
import * as threadForms from '$lib/forms/thread';
import * as vettingForms from '$lib/forms/vetting';
import * as jobRequest from '$lib/scope/request';
import * as quoteForms from '../../src/routes/(installer)/installer/jobs/[id=uuid]/quote-form';

const MODULES = {
	accountForms,
	authForms,
	fitNoteForms,
	fitReportForms,
	jobForms,
	threadForms,
	vettingForms,
	jobRequest,
	quoteForms
};

const schemas = Object.entries(MODULES).flatMap(([module, exports]) =>
	Object.entries(exports)
		.filter((entry): entry is [string, z.ZodObject] => entry[1] instanceof z.ZodObject)
		.map(([name, schema]) => ({ name: `${module}.${name}`, schema }))
);

/** Issues a value for one field raises at that field, the other fields left out. */
function issuesAt(schema: z.ZodObject, key: string, value: unknown) {
	const result = schema.safeParse({ [key]: value });
	return (result.error?.issues ?? []).filter((i) => i.path[0] === key);
}

// Plain text within every field's length limits; the same with a NUL in the middle.
const PLAIN = 'Plain text 123';
const WITH_NUL = 'Plain te\u0000t 123';

const textFields = schemas.flatMap(({ name, schema }) =>
	Object.keys(schema.shape).flatMap((key) =>
		[PLAIN, [PLAIN]]
			.filter((probe) => issuesAt(schema, key, probe).length === 0)
			.map((probe) => ({
				field: `${name}.${key}`,
				schema,
				key,
				withNul: Array.isArray(probe) ? [WITH_NUL] : WITH_NUL
			}))
	)
);

describe('every free-text field refuses NUL characters', () => {
	it('finds the schemas and their text fields', () => {
		expect(schemas.length).toBeGreaterThanOrEqual(14);
		expect(textFields.map((f) => f.field)).toEqual(
			expect.arrayContaining([
				'authForms.signUpSchema.displayName',
				'authForms.signInSchema.redirectTo',
				'jobForms.placeStepSchema.addressLine',
				'jobRequest.jobRequestSchema.model',
				'vettingForms.decisionSchema.message',
				'threadForms.threadMessageSchema.body',
				'quoteForms.quoteFormSchema.message',
				'fitNoteForms.fitNoteSchema.pitfalls',
				'fitNoteForms.fitNoteMarkSchema.comment',
				'fitReportForms.fitReportSchema.groundPoint',
				'fitReportForms.fitReportRearSchema.rearDemisterReason'
			])
		);
	});

	it.each(textFields)('$field', ({ schema, key, withNul }) => {
		expect(issuesAt(schema, key, withNul).map((i) => i.message)).toContain(NUL_MESSAGE);
	});
});

describe('date fields refuse days that do not exist', () => {
	// 2026 is not a leap year; April has 30 days (Gregorian calendar).
	const impossible = ['2026-02-29', '2026-02-30', '2026-04-31', '2026-13-01', '2026-00-10'];
	const dateFields = [
		{ field: 'placeStepSchema.date1', schema: jobForms.placeStepSchema, key: 'date1' },
		{ field: 'blockedDateSchema.day', schema: vettingForms.blockedDateSchema, key: 'day' },
		{ field: 'insuranceSchema.expiresOn', schema: vettingForms.insuranceSchema, key: 'expiresOn' },
		{ field: 'quoteFormSchema.expiresOn', schema: quoteForms.quoteFormSchema, key: 'expiresOn' },
		{ field: 'quoteFormSchema.slotDate', schema: quoteForms.quoteFormSchema, key: 'slotDate' }
	];

	it.each(dateFields)('$field', ({ schema, key }) => {
		for (const day of impossible) {
			const value = key === 'slotDate' ? [day] : day;
			expect({ day, issues: issuesAt(schema, key, value).length > 0 }).toEqual({
				day,
				issues: true
			});
		}
		// A real day is not refused as a date (29 February 2028 exists).
		const real = key === 'slotDate' ? ['2028-02-29'] : '2028-02-29';
		expect(issuesAt(schema, key, real).map((i) => i.message)).not.toContain(
			'Choose a date that exists on the calendar'
		);
	});
});

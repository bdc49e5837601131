/**
 * Reads a dispute form (words and up to MAX_DISPUTE_PHOTOS photos) for the owner's, the
 * installer's and the admin's dispute pages: the words through the form's zod schema, then each
 * photo through the one upload pipeline (re-encoded, no EXIF or GPS). A refused photo discards
 * the ones already stored. The caller discards the photos when the domain call refuses.
 */
import { fail, type ActionFailure } from '@sveltejs/kit';
import type { z } from 'zod';
import { MAX_DISPUTE_PHOTOS } from '$lib/forms/dispute';
import { discardUpload, storeUpload, type StoredUpload } from '../files/uploads';
import { readFormData, UNREADABLE_FORM_MESSAGE } from './form-data';

type Values = Record<string, string>;

/** What a refused dispute form answers: the first problem, field messages, the values sent. */
export interface DisputeFormFailure {
	problem: string;
	fields?: Record<string, string>;
	values?: Values;
}

const refused = (problem: string, more: Omit<DisputeFormFailure, 'problem'> = {}) =>
	fail(400, { problem, ...more } satisfies DisputeFormFailure);

/** The form's values or a `fail(400, …)` with the first problem, field messages and the values. */
export async function readDisputeForm<S extends z.ZodType>(
	request: Request,
	schema: S,
	photoPrefix: string | null
): Promise<
	| { ok: true; data: z.output<S>; photos: StoredUpload[]; values: Values }
	| { ok: false; failure: ActionFailure<DisputeFormFailure> }
> {
	const form = await readFormData(request);
	if (!form) return { ok: false, failure: refused(UNREADABLE_FORM_MESSAGE) };
	const values: Values = {};
	for (const [key, value] of form.entries()) {
		if (typeof value === 'string') values[key] = value;
	}
	const parsed = schema.safeParse(values);
	if (!parsed.success) {
		const fields: Record<string, string> = {};
		for (const issue of parsed.error.issues) {
			const key = String(issue.path[0] ?? 'form');
			fields[key] ??= issue.message;
		}
		return {
			ok: false,
			failure: refused('Please check the marked fields.', { fields, values })
		};
	}
	const files = photoPrefix
		? form.getAll('photos').filter((f): f is File => f instanceof File && f.size > 0)
		: [];
	if (files.length > MAX_DISPUTE_PHOTOS) {
		return {
			ok: false,
			failure: refused(`Attach at most ${String(MAX_DISPUTE_PHOTOS)} photos at a time.`, {
				fields: { photos: `At most ${String(MAX_DISPUTE_PHOTOS)} photos` },
				values
			})
		};
	}
	const photos: StoredUpload[] = [];
	for (const file of files) {
		const stored = await storeUpload(file, photoPrefix!);
		if (!stored.ok) {
			await Promise.all(photos.map((p) => discardUpload(p)));
			return {
				ok: false,
				failure: refused(`${file.name}: ${stored.problem}`, {
					fields: { photos: stored.problem },
					values
				})
			};
		}
		photos.push(stored.stored);
	}
	return { ok: true, data: parsed.data, photos, values };
}

/** Removes photos stored for an entry the domain refused. */
export async function discardPhotos(photos: StoredUpload[]): Promise<void> {
	await Promise.all(photos.map((p) => discardUpload(p)));
}

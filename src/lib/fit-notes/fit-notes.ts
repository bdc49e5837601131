/**
 * Fit notes, the pure part: how a vehicle name is normalised for search, how year ranges match,
 * what a note's standing says, and the check that keeps owners' details out of a note. No I/O.
 */
import { maskContactDetails } from '../masking';

/** Notes to a page of the list and the search (Tapline's choice). */
export const FIT_NOTES_PAGE_SIZE = 20;

/**
 * Word similarity (pg_trgm) each searched word must reach against a note's make and model: 0.3,
 * pg_trgm's own default threshold for `%`, lets a typo or two per word through
 * (tests/integration/fit-notes.test.ts holds it to that).
 */
export const SEARCH_SIMILARITY = 0.3;

/** Beside a job: a stricter similarity, since nobody typed the words as a search (our choice). */
export const JOB_MATCH_SIMILARITY = 0.45;

/** Oldest and newest model years a note may cover (Tapline's bounds: a typo guard). */
export const FIRST_MODEL_YEAR = 1950;
export const LAST_MODEL_YEAR = 2100;

/**
 * A make and model as search compares them: lower case, accents dropped, anything but letters
 * and digits a single space, and letters and digits that touch split apart ("Aster2" and
 * "aster 2", "X-Line" and "x line" read alike).
 * @param text a make, a model, or both, as typed
 */
export function vehicleKey(text: string): string {
	return text
		.normalize('NFKD')
		.replace(/\p{M}/gu, '')
		.toLowerCase()
		.replace(/(\p{L})(\p{N})/gu, '$1 $2')
		.replace(/(\p{N})(\p{L})/gu, '$1 $2')
		.replace(/[^\p{L}\p{N}]+/gu, ' ')
		.trim();
}

/** Whether a note for years `from`–`to` (inclusive) covers a vehicle of `year`. */
export const coversYear = (note: { yearFrom: number; yearTo: number }, year: number) =>
	note.yearFrom <= year && year <= note.yearTo;

/** "2015–2019", or "2017" for a single year. */
export const yearRangeText = (from: number, to: number) =>
	from === to ? String(from) : `${String(from)}–${String(to)}`;

/**
 * A model year typed in a search box, or null when the box holds no usable year.
 * @param text the box's value
 */
export function searchYear(text: string | null | undefined): number | null {
	const t = (text ?? '').trim();
	if (!/^\d{4}$/.test(t)) return null;
	const y = Number(t);
	return y >= FIRST_MODEL_YEAR && y <= LAST_MODEL_YEAR ? y : null;
}

/** A note's standing in words: how many fits confirmed it, and how many found it wrong. */
export function standingText(confirmed: number, wrong: number): string {
	const c =
		confirmed === 0
			? 'Not yet confirmed on another fit'
			: `Confirmed on ${String(confirmed)} other fit${confirmed === 1 ? '' : 's'}`;
	return wrong === 0 ? c : `${c}; marked wrong by ${String(wrong)}`;
}

// A street address: a number, a name, and a street word (Australian usage, from memory).
const STREET =
	/\b\d{1,5}[a-z]?\s+(?:[a-z'-]+\s+){1,3}(?:street|st|road|rd|avenue|ave|court|ct|parade|pde|terrace|tce|drive|dr|lane|ln|crescent|cres|place|pl|way|highway|hwy|boulevard|blvd|close|grove)\b/i;
// A number plate named as such: "plate", "rego" or "registration", then letters and digits.
const PLATE =
	/\b(?:plate|rego|registration)\b[\s:#.-]*(?:(?:no|number|is)\b\.?)?[\s:#.-]*([a-z0-9]{1,4}[ -]?[a-z0-9]{1,4})\b/i;

function namesPlate(text: string): boolean {
	const token = PLATE.exec(text)?.[1];
	return token !== undefined && /\d/.test(token) && /[a-z]/i.test(token);
}

/**
 * Why a piece of note text may not be published, or null: fit notes are about the vehicle, so
 * contact details ($lib/masking's patterns), a street address or a number plate are refused
 * rather than stored. The owner's name is checked by the server, which knows it.
 * @param text one free-text field of a note
 */
export function privateDetailProblem(text: string): string | null {
	if (maskContactDetails(text).masked.length > 0) {
		return 'Leave out phone numbers, e-mail addresses and links: a fit note is about the vehicle only.';
	}
	if (STREET.test(text)) return 'Leave out addresses: a fit note is about the vehicle only.';
	if (namesPlate(text)) return 'Leave out number plates: a fit note is about the vehicle only.';
	return null;
}

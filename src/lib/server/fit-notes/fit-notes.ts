/**
 * Fit notes: what an installer learned on one vehicle, published after their fit report and read
 * only by vetted installers in good standing (approved, not paused, account not suspended or
 * closed). Owners never reach them (the /installer area is closed to them, and every function here
 * checks the reader's standing first). Search is trigram similarity (pg_trgm, migration
 * fit-note-search) on the normalised make and model plus a year-range test, filtered, sorted
 * and paged in SQL. Marks: one per installer per note, never on one's own.
 */
import { and, asc, count, desc, eq, isNull, sql, type SQL } from 'drizzle-orm';
import {
	FIT_NOTES_PAGE_SIZE,
	JOB_MATCH_SIMILARITY,
	SEARCH_SIMILARITY,
	vehicleKey
} from '$lib/fit-notes/fit-notes';
import type { FitNoteInput, FitNoteMarkInput } from '$lib/forms/fit-note';
import { canQuote } from '$lib/people/vetting';
import { db } from '../db';
import {
	booking,
	fitNote,
	fitNoteMark,
	fitNotePhoto,
	fitReport,
	installerProfile,
	job,
	user
} from '../db/schema';
import { refuse, type Refusal } from '../refusal';

/** Shown to an installer who is not (or no longer) vetted and in good standing. */
export const FIT_NOTES_FOR_VETTED =
	'Fit notes are shared among vetted installers in good standing. They open to you once your application is approved, and while your quoting is not paused.';
export const NO_SUCH_NOTE = 'There is no such fit note.';
const NO_SUCH_FIT = 'There is no such fit among yours.';

/** Words of a search that count (more add nothing for a make and model). */
const MAX_SEARCH_WORDS = 6;

/** At most this many photos on one note (Tapline's bound). */
export const MAX_NOTE_PHOTOS = 6;

/** The reader's standing: a refusal when they may not read fit notes, and their time zone. */
async function readerStanding(installerId: string) {
	const [row] = await db
		.select({
			vettingStatus: installerProfile.vettingStatus,
			pausedReason: installerProfile.pausedReason,
			timeZone: installerProfile.timeZone,
			suspendedAt: user.suspendedAt,
			deletedAt: user.deletedAt
		})
		.from(installerProfile)
		.innerJoin(user, eq(user.id, installerProfile.userId))
		.where(eq(installerProfile.userId, installerId));
	const problem =
		!row || !canQuote(row) || row.suspendedAt || row.deletedAt
			? refuse(403, FIT_NOTES_FOR_VETTED)
			: null;
	return { problem, timeZone: row?.timeZone ?? 'Australia/Adelaide' };
}

/** Whether the installer may read and write fit notes: a refusal, or null when they may. */
export async function fitNoteReaderProblem(installerId: string): Promise<Refusal | null> {
	return (await readerStanding(installerId)).problem;
}

/** The booking's vehicle and fit time, for the publish form; or why no note can be published. */
export async function getPublishContext(installerId: string, bookingId: string) {
	const problem = await fitNoteReaderProblem(installerId);
	if (problem) return problem;
	const [row] = await db
		.select({
			bookingId: booking.id,
			jobId: booking.jobId,
			request: job.request,
			title: job.title,
			noteId: fitNote.id
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.leftJoin(fitNote, eq(fitNote.bookingId, booking.id))
		.where(and(eq(booking.id, bookingId), eq(booking.installerId, installerId)));
	if (!row) return refuse(404, NO_SUCH_FIT);
	const [report] = await db
		.select({ minutesTaken: fitReport.minutesTaken })
		.from(fitReport)
		.where(and(eq(fitReport.bookingId, bookingId), eq(fitReport.installerId, installerId)))
		.orderBy(asc(fitReport.visit))
		.limit(1);
	if (!report) {
		return refuse(409, 'File the fit report for this booking first; the note takes its time.');
	}
	return { ok: true as const, ...row, minutesTaken: report.minutesTaken };
}

/** Words of the owner's name (3 letters or more) found in a note's text, for refusing it. */
function mentionsName(texts: readonly string[], name: string): boolean {
	const words = name
		.toLowerCase()
		.split(/[^\p{L}]+/u)
		.filter((w) => w.length >= 3);
	if (words.length === 0) return false;
	const haystack = ` ${texts
		.join(' ')
		.toLowerCase()
		.replace(/[^\p{L}]+/gu, ' ')} `;
	return words.some((w) => haystack.includes(` ${w} `));
}

const TEXT_FIELDS = [
	'make',
	'model',
	'fuseBoxLocation',
	'fuseBoxAccess',
	'switchedFuse',
	'permanentFuse',
	'groundPoints',
	'trimRemoval',
	'grommetRoute',
	'pitfalls'
] as const;

/**
 * Publishes the installer's note for a booking of theirs that has a fit report: one note per
 * booking (the unique key on booking_id decides a double click). The owner's name anywhere in the
 * text is refused, as contact details, addresses and plates are by the form's schema.
 */
export async function publishFitNote(
	installerId: string,
	bookingId: string,
	input: FitNoteInput
): Promise<{ ok: true; noteId: string } | Refusal> {
	const context = await getPublishContext(installerId, bookingId);
	if (!context.ok) return context;
	if (context.noteId) return refuse(409, 'You have already published a note for this fit.');
	const [owner] = await db
		.select({ name: user.displayName })
		.from(booking)
		.innerJoin(user, eq(user.id, booking.ownerId))
		.where(eq(booking.id, bookingId));
	if (
		owner &&
		mentionsName(
			TEXT_FIELDS.map((f) => input[f] ?? ''),
			owner.name
		)
	) {
		return refuse(400, "Leave out the owner's name: a fit note is about the vehicle only.");
	}
	const [row] = await db
		.insert(fitNote)
		.values({
			bookingId,
			authorId: installerId,
			make: input.make,
			model: input.model,
			vehicleKey: vehicleKey(`${input.make} ${input.model}`),
			yearFrom: input.yearFrom,
			yearTo: input.yearTo,
			bodyStyle: input.bodyStyle,
			fuseFamily: input.fuseFamily,
			fuseBoxLocation: input.fuseBoxLocation,
			fuseBoxAccess: input.fuseBoxAccess,
			switchedFuse: input.switchedFuse,
			switchedRatingAmps: input.switchedRatingAmps,
			permanentFuse: input.permanentFuse || null,
			permanentRatingAmps: input.permanentRatingAmps ?? null,
			groundPoints: input.groundPoints,
			trimRemoval: input.trimRemoval,
			grommetRoute: input.grommetRoute || null,
			pitfalls: input.pitfalls || null,
			minutesTaken: context.minutesTaken
		})
		.onConflictDoNothing({ target: fitNote.bookingId })
		.returning({ id: fitNote.id });
	if (!row) return refuse(409, 'You have already published a note for this fit.');
	return { ok: true, noteId: row.id };
}

/** What a search asks for. */
export interface FitNoteSearch {
	/** Make and/or model as typed; empty for every note. */
	q: string;
	year: number | null;
	bodyStyle: string | null;
	page: number;
}

const confirmedCount = sql<number>`(select count(*)::int from fit_note_mark m
	where m.note_id = ${fitNote.id} and m.verdict = 'confirmed')`;
const wrongCount = sql<number>`(select count(*)::int from fit_note_mark m
	where m.note_id = ${fitNote.id} and m.verdict = 'wrong')`;

const listColumns = {
	id: fitNote.id,
	make: fitNote.make,
	model: fitNote.model,
	yearFrom: fitNote.yearFrom,
	yearTo: fitNote.yearTo,
	bodyStyle: fitNote.bodyStyle,
	minutesTaken: fitNote.minutesTaken,
	createdAt: fitNote.createdAt,
	businessName: installerProfile.businessName,
	confirmed: confirmedCount,
	wrong: wrongCount
};

/**
 * A page of notes for a vetted installer: every note newest first, or those whose make and model
 * are similar to `q` (best match first), optionally covering a model year and of a body style.
 */
export async function searchFitNotes(installerId: string, search: FitNoteSearch) {
	const problem = await fitNoteReaderProblem(installerId);
	if (problem) return problem;
	const key = vehicleKey(search.q);
	// Every word typed must resemble a word of the note's make and model ("<%": word similarity
	// at least the threshold, on the GIN trigram index), so "corvin astr" finds "Corvan Aster"
	// but "quorra aster" does not find "Corvan Aster" on the strength of "aster" alone.
	const words = key.split(' ').filter(Boolean).slice(0, MAX_SEARCH_WORDS);
	const where: SQL[] = words.map((w) => sql`${w} <% ${fitNote.vehicleKey}`);
	if (search.year !== null) {
		where.push(sql`${fitNote.yearFrom} <= ${search.year} and ${search.year} <= ${fitNote.yearTo}`);
	}
	if (search.bodyStyle) where.push(eq(fitNote.bodyStyle, search.bodyStyle));
	const score = sql<number>`similarity(${fitNote.vehicleKey}, ${key})`;
	const rows = await db.transaction(async (tx) => {
		// The threshold "<%" applies, for this transaction only (pg_trgm's default is 0.6).
		await tx.execute(
			sql`select set_config('pg_trgm.word_similarity_threshold', ${String(SEARCH_SIMILARITY)}, true)`
		);
		return tx
			.select(listColumns)
			.from(fitNote)
			.innerJoin(installerProfile, eq(installerProfile.userId, fitNote.authorId))
			.where(and(...where))
			.orderBy(...(key ? [desc(score)] : []), desc(fitNote.createdAt), desc(fitNote.id))
			.limit(FIT_NOTES_PAGE_SIZE + 1)
			.offset((search.page - 1) * FIT_NOTES_PAGE_SIZE);
	});
	return {
		ok: true as const,
		rows: rows.slice(0, FIT_NOTES_PAGE_SIZE),
		more: rows.length > FIT_NOTES_PAGE_SIZE
	};
}

/**
 * Notes for the vehicle of a job an installer is looking at: same body style, covering its year,
 * make and model similar (stricter than a typed search). Empty for a reader not in good standing.
 */
export async function notesForVehicle(
	installerId: string,
	vehicle: { make: string; model: string; year: string | number; bodyStyle: string },
	limit = 3
) {
	if (await fitNoteReaderProblem(installerId)) return [];
	const year = Number(vehicle.year);
	const key = vehicleKey(`${vehicle.make} ${vehicle.model}`);
	if (!key || !Number.isInteger(year)) return [];
	const score = sql<number>`similarity(${fitNote.vehicleKey}, ${key})`;
	return db
		.select(listColumns)
		.from(fitNote)
		.innerJoin(installerProfile, eq(installerProfile.userId, fitNote.authorId))
		.where(
			and(
				eq(fitNote.bodyStyle, vehicle.bodyStyle),
				sql`${fitNote.yearFrom} <= ${year} and ${year} <= ${fitNote.yearTo}`,
				sql`${score} >= ${JOB_MATCH_SIMILARITY}`
			)
		)
		.orderBy(desc(score), desc(confirmedCount), desc(fitNote.createdAt))
		.limit(limit);
}

/** One note with its photos and marks, for a vetted installer. */
export async function getFitNote(installerId: string, noteId: string) {
	const { problem, timeZone } = await readerStanding(installerId);
	if (problem) return problem;
	const [row] = await db
		.select({ note: fitNote, businessName: installerProfile.businessName })
		.from(fitNote)
		.innerJoin(installerProfile, eq(installerProfile.userId, fitNote.authorId))
		.where(eq(fitNote.id, noteId));
	if (!row) return refuse(404, NO_SUCH_NOTE);
	const [photos, marks] = await Promise.all([
		db
			.select({ id: fitNotePhoto.id, width: fitNotePhoto.width, height: fitNotePhoto.height })
			.from(fitNotePhoto)
			.where(eq(fitNotePhoto.noteId, noteId))
			.orderBy(asc(fitNotePhoto.createdAt)),
		db
			.select({
				installerId: fitNoteMark.installerId,
				businessName: installerProfile.businessName,
				verdict: fitNoteMark.verdict,
				comment: fitNoteMark.comment,
				createdAt: fitNoteMark.createdAt
			})
			.from(fitNoteMark)
			.innerJoin(installerProfile, eq(installerProfile.userId, fitNoteMark.installerId))
			.where(eq(fitNoteMark.noteId, noteId))
			.orderBy(desc(fitNoteMark.createdAt))
	]);
	const { bookingId: _booking, authorId, ...note } = row.note;
	return {
		ok: true as const,
		timeZone,
		note: { ...note, businessName: row.businessName },
		mine: authorId === installerId,
		photos,
		marks: marks.map(({ installerId: by, ...m }) => ({ ...m, mine: by === installerId })),
		confirmed: marks.filter((m) => m.verdict === 'confirmed').length,
		wrong: marks.filter((m) => m.verdict === 'wrong').length,
		myMark: marks.find((m) => m.installerId === installerId)?.verdict ?? null
	};
}

/** Marks another installer's note as confirmed or wrong on the reader's own fit, once. */
export async function markFitNote(
	installerId: string,
	noteId: string,
	input: FitNoteMarkInput
): Promise<{ ok: true } | Refusal> {
	const problem = await fitNoteReaderProblem(installerId);
	if (problem) return problem;
	const [note] = await db
		.select({ authorId: fitNote.authorId })
		.from(fitNote)
		.where(eq(fitNote.id, noteId));
	if (!note) return refuse(404, NO_SUCH_NOTE);
	if (note.authorId === installerId) {
		return refuse(403, 'Your own note is marked by other installers, not by you.');
	}
	const [row] = await db
		.insert(fitNoteMark)
		.values({ noteId, installerId, verdict: input.verdict, comment: input.comment })
		.onConflictDoNothing()
		.returning({ noteId: fitNoteMark.noteId });
	if (!row) return refuse(409, 'You have already marked this note.');
	return { ok: true };
}

/**
 * Adds a stored photo to the author's own note (at most {@link MAX_NOTE_PHOTOS}); the count is
 * checked under the note's row lock so two uploads at once cannot pass the bound.
 */
export async function addFitNotePhoto(
	installerId: string,
	noteId: string,
	stored: { objectKey: string; thumbKey: string; width: number; height: number; bytes: number }
): Promise<{ ok: true } | Refusal> {
	const problem = await fitNoteReaderProblem(installerId);
	if (problem) return problem;
	return db.transaction(async (tx) => {
		const [note] = await tx
			.select({ authorId: fitNote.authorId })
			.from(fitNote)
			.where(eq(fitNote.id, noteId))
			.for('update');
		if (!note) return refuse(404, NO_SUCH_NOTE);
		if (note.authorId !== installerId) {
			return refuse(403, 'Only the installer who wrote a note adds its photos.');
		}
		const [n] = await tx
			.select({ n: count() })
			.from(fitNotePhoto)
			.where(eq(fitNotePhoto.noteId, noteId));
		if ((n?.n ?? 0) >= MAX_NOTE_PHOTOS) {
			return refuse(409, `A note takes up to ${String(MAX_NOTE_PHOTOS)} photos.`);
		}
		await tx.insert(fitNotePhoto).values({ noteId, ...stored });
		return { ok: true as const };
	});
}

/** A note photo's storage keys when the viewer is a vetted installer in good standing. */
export async function findViewableFitNotePhoto(photoId: string, viewerId: string) {
	if (await fitNoteReaderProblem(viewerId)) return null;
	const [row] = await db
		.select({ objectKey: fitNotePhoto.objectKey, thumbKey: fitNotePhoto.thumbKey })
		.from(fitNotePhoto)
		.where(eq(fitNotePhoto.id, photoId));
	return row ?? null;
}

/** Whether the installer's booking has a fit report and no note yet (the job page offers to publish). */
export async function fitsAwaitingNote(installerId: string, bookingId: string) {
	const [row] = await db
		.select({ id: booking.id })
		.from(booking)
		.innerJoin(fitReport, eq(fitReport.bookingId, booking.id))
		.leftJoin(fitNote, eq(fitNote.bookingId, booking.id))
		.where(and(eq(booking.id, bookingId), eq(booking.installerId, installerId), isNull(fitNote.id)))
		.limit(1);
	return Boolean(row);
}

/**
 * Owners' jobs: drafting step by step, posting with a computed scope sheet, editing while no quote
 * is in, withdrawing, listing. Every change locks the job row and re-checks ownership and state in
 * one transaction, so nothing is half-written and two tabs cannot interleave.
 */
import { getMarketSettings, scopeMarketOf } from '../money/settings';
import { and, asc, count, desc, eq, sql, type SQL } from 'drizzle-orm';
import { formatInZone } from '$lib/time';
import { preferredWindowText } from '$lib/labels';
import { jobRequestSchema } from '$lib/scope';
import {
	preferredDateProblem,
	type JobStep,
	type PhotoKind,
	type TimeWindow
} from '$lib/forms/job';
import { similarFitMinutes } from './calibration';
import { unconfirmedEmail } from '../people/confirmed-email';
import { db, type Tx } from '../db';
import { installerProfile, job, jobPhoto, quote, user, type Job } from '../db/schema';
import { appUrl } from '../mail/app-url';
import { withMail } from '../mail/outbox';
import { isRefusal, NOT_YOUR_JOB, refuse, type Refusal } from '../refusal';
import { jobTitle, postedJobColumns, titleOrUntitled } from '$lib/marketplace/posted-job';

/** Statuses in which an owner may still change the request (and only while no quote is in). */
const EDITABLE = new Set<Job['status']>(['drafting', 'collecting_quotes']);

/** A change that went through. */
export type JobChange = { ok: true } | Refusal;
const DONE = { ok: true } as const;

const LOCKED = 'This job has a quote or a booking now, so its details can no longer change.';

// A correlated count; `$count` qualifies the columns (a bare sql`` would not, and inside the
// subquery an unqualified "id" would mean the quote's own id).
const quoteCount = () => db.$count(quote, eq(quote.jobId, job.id));

/** Starts an empty draft for an owner; returns its id. */
export async function createDraftJob(ownerId: string): Promise<string> {
	const [row] = await db.insert(job).values({ ownerId }).returning({ id: job.id });
	return row!.id;
}

/** The owner's job with its quote count, or null when it is not theirs (or not a job id at all). */
export async function getOwnedJob(jobId: string, ownerId: string) {
	const [row] = await db
		.select({ job, quotes: quoteCount() })
		.from(job)
		.where(and(eq(job.id, jobId), eq(job.ownerId, ownerId)));
	if (!row) return null;
	return {
		...row.job,
		quoteCount: row.quotes,
		editable: EDITABLE.has(row.job.status) && row.quotes === 0
	};
}

/** Locks the owner's job for a change and says whether it may still be edited. */
async function lockEditable(tx: Tx, jobId: string, ownerId: string): Promise<Job | Refusal> {
	const [row] = await tx
		.select()
		.from(job)
		.where(and(eq(job.id, jobId), eq(job.ownerId, ownerId)))
		.for('update');
	if (!row) return refuse(404, NOT_YOUR_JOB);
	const [quotes] = await tx.select({ n: count() }).from(quote).where(eq(quote.jobId, jobId));
	if (!EDITABLE.has(row.status) || (quotes?.n ?? 0) > 0) return refuse(409, LOCKED);
	return row;
}

/** Merges one step's answers into the draft and records the step reached. */
export async function saveJobStep(
	jobId: string,
	ownerId: string,
	step: JobStep,
	values: Record<string, unknown>,
	columns: Partial<typeof job.$inferInsert> = {}
): Promise<JobChange> {
	return db.transaction(async (tx) => {
		const locked = await lockEditable(tx, jobId, ownerId);
		if (isRefusal(locked)) return locked;
		await tx
			.update(job)
			.set({
				...columns,
				draft: { ...locked.draft, ...values },
				draftStep: step,
				updatedAt: new Date()
			})
			.where(eq(job.id, jobId));
		return DONE;
	});
}

export interface PlaceAnswers {
	locationMode: 'mobile' | 'workshop';
	suburb: string;
	postcode: string;
	lat: number;
	lng: number;
	addressLine: string | null;
	windows: Array<{ date: string; window: TimeWindow }>;
}

/** Checks preferred dates against the job's local "today"; returns a message per bad date. */
export function checkPreferredDates(
	windows: PlaceAnswers['windows'],
	timeZone: string,
	now = new Date()
): string | null {
	const today = formatInZone(now, timeZone, 'yyyy-MM-dd');
	for (const w of windows) {
		const problem = preferredDateProblem(w.date, today);
		if (problem) return problem;
	}
	return null;
}

export type PostProblem = { step: JobStep; message: string };

/**
 * Validates the whole draft, computes the scope sheet and opens the job for quotes (or saves an
 * edit of an open job). Returns the problems that keep it from posting.
 */
export async function postJob(
	jobId: string,
	ownerId: string,
	now = new Date()
): Promise<JobChange> {
	return db.transaction(async (tx) => {
		const locked = await lockEditable(tx, jobId, ownerId);
		if (isRefusal(locked)) return locked;
		const unconfirmed = await unconfirmedEmail(tx, ownerId);
		if (unconfirmed) return unconfirmed;
		const problems = draftProblems(locked, now);
		if (problems.length > 0) {
			// Each problem names the step that fixes it.
			return refuse(400, problems[0]!.message, {
				fields: Object.fromEntries(problems.map((p) => [p.step, p.message]))
			});
		}
		const request = jobRequestSchema.parse(locked.draft);
		await tx
			.update(job)
			.set({
				status: 'collecting_quotes',
				...postedJobColumns(
					request,
					scopeMarketOf(await getMarketSettings(tx)),
					await similarFitMinutes(request, now, tx)
				),
				draftStep: 'review',
				submittedAt: locked.submittedAt ?? now,
				updatedAt: now
			})
			.where(eq(job.id, jobId));
		return DONE;
	});
}

/** What still stops a draft from posting, each tied to the step that fixes it. */
export function draftProblems(draft: Job, now = new Date()): PostProblem[] {
	const problems: PostProblem[] = [];
	const parsed = jobRequestSchema.safeParse(draft.draft);
	if (!parsed.success) {
		const vehicleFields = new Set([
			'make',
			'model',
			'year',
			'bodyStyle',
			'fuseFamily',
			'batteryType',
			'batteryAh',
			'startStop',
			'hybridOrEv',
			'curtainAirbags'
		]);
		const powerFields = new Set(['power', 'parkingDrawMilliamps', 'cutOffVolts', 'restVolts']);
		for (const issue of parsed.error.issues) {
			const field = String(issue.path[0] ?? '');
			const step: JobStep = vehicleFields.has(field)
				? 'vehicle'
				: powerFields.has(field)
					? 'power'
					: 'cameras';
			if (!problems.some((p) => p.step === step)) problems.push({ step, message: issue.message });
		}
	}
	if (draft.latitude === null || draft.longitude === null || draft.preferredWindows.length === 0) {
		problems.push({ step: 'place', message: 'Say where the car will be and when suits you' });
	} else {
		const dateProblem = checkPreferredDates(draft.preferredWindows, draft.timeZone, now);
		if (dateProblem)
			problems.push({ step: 'place', message: `Preferred dates: ${dateProblem.toLowerCase()}` });
	}
	return problems;
}

/** What an owner may change on a job that installers have quoted on. */
export interface JobAdjustment {
	windows: PlaceAnswers['windows'];
	/** The note to installers; empty removes it. */
	note: string;
}

/** An adjustment that went through, and how many quoting installers were told. */
export type JobAdjusted = { ok: true; told: number } | Refusal;

/**
 * Changes the dates that suit the owner and the note to installers on a job taking quotes, and
 * e-mails every installer with a live quote what changed, in the same transaction. The car,
 * cameras, power and place stay: they are what the quotes priced. Quotes stay as sent; an
 * installer whose times no longer suit can revise theirs.
 */
export async function adjustOpenJob(
	jobId: string,
	ownerId: string,
	change: JobAdjustment,
	now = new Date()
): Promise<JobAdjusted> {
	return withMail(async (tx, mail) => {
		const [row] = await tx
			.select()
			.from(job)
			.where(and(eq(job.id, jobId), eq(job.ownerId, ownerId)))
			.for('update');
		if (!row) return refuse(404, NOT_YOUR_JOB);
		if (row.status !== 'collecting_quotes') {
			return refuse(
				409,
				'Dates and the note can change only while the job takes quotes; this one does not any more.'
			);
		}
		const dateProblem = checkPreferredDates(change.windows, row.timeZone, now);
		if (dateProblem) return refuse(400, dateProblem, { fields: { date1: dateProblem } });
		const note = change.note.trim() === '' ? null : change.note.trim();
		const sameDates = JSON.stringify(row.preferredWindows) === JSON.stringify(change.windows);
		if (sameDates && note === row.ownerNote) return { ok: true, told: 0 };
		const draftDates = Object.fromEntries(
			[0, 1, 2].flatMap((i) => [
				[`date${String(i + 1)}`, change.windows[i]?.date ?? ''],
				[`window${String(i + 1)}`, change.windows[i]?.window ?? 'morning']
			])
		);
		await tx
			.update(job)
			.set({
				preferredWindows: change.windows,
				ownerNote: note,
				draft: { ...row.draft, ...draftDates },
				updatedAt: now
			})
			.where(eq(job.id, jobId));
		const quoting = await tx
			.select({ email: user.email, businessName: installerProfile.businessName })
			.from(quote)
			.innerJoin(installerProfile, eq(installerProfile.userId, quote.installerId))
			.innerJoin(user, eq(user.id, quote.installerId))
			.where(and(eq(quote.jobId, jobId), eq(quote.status, 'live')));
		const title = titleOrUntitled(row.title);
		for (const person of quoting) {
			await mail.send(person.email, {
				template: 'job-adjusted',
				data: {
					businessName: person.businessName,
					title,
					dates: sameDates ? null : change.windows.map((w) => preferredWindowText(w, now)),
					noteChanged: note !== row.ownerNote,
					url: appUrl(`/installer/jobs/${jobId}`)
				}
			});
		}
		return { ok: true, told: quoting.length };
	});
}

/** Withdraws a job that is not booked, with the owner's reason. */
export async function withdrawJob(
	jobId: string,
	ownerId: string,
	reason: string
): Promise<JobChange> {
	return db.transaction(async (tx) => {
		const [row] = await tx
			.select({ status: job.status })
			.from(job)
			.where(and(eq(job.id, jobId), eq(job.ownerId, ownerId)))
			.for('update');
		if (!row) return refuse(404, NOT_YOUR_JOB);
		if (!EDITABLE.has(row.status)) {
			return refuse(
				409,
				'A booked job cannot be withdrawn here; contact the installer or raise a dispute.'
			);
		}
		await tx
			.update(job)
			.set({
				status: 'withdrawn',
				withdrawnReason: reason,
				withdrawnAt: new Date(),
				updatedAt: new Date()
			})
			.where(eq(job.id, jobId));
		return DONE;
	});
}

export const JOB_SORTS = ['created', 'status', 'date', 'quotes'] as const;
export type JobSort = (typeof JOB_SORTS)[number];

/** One page of an owner's jobs with quote counts, sorted as asked. */
export async function listOwnerJobs(
	ownerId: string,
	options: { sort: JobSort; dir: 'asc' | 'desc'; page: number; pageSize: number }
) {
	const quotes = quoteCount();
	const firstDate = sql<string | null>`(${job.preferredWindows} -> 0 ->> 'date')`;
	const keys: Record<JobSort, SQL | typeof job.createdAt | typeof job.status> = {
		created: job.createdAt,
		status: job.status,
		date: firstDate,
		quotes
	};
	const order = options.dir === 'asc' ? asc : desc;
	const [rows, [total]] = await Promise.all([
		db
			.select({
				id: job.id,
				title: job.title,
				status: job.status,
				draft: job.draft,
				createdAt: job.createdAt,
				firstDate,
				suburb: job.suburb,
				quotes
			})
			.from(job)
			.where(eq(job.ownerId, ownerId))
			.orderBy(order(keys[options.sort]), desc(job.createdAt))
			.limit(options.pageSize)
			.offset((options.page - 1) * options.pageSize),
		db.select({ n: count() }).from(job).where(eq(job.ownerId, ownerId))
	]);
	return {
		rows: rows.map(({ draft, ...r }) => ({
			...r,
			title: r.title ?? jobTitle(draft)
		})),
		total: total?.n ?? 0
	};
}

/** The job's photos, by kind. */
export function listJobPhotos(jobId: string) {
	return db
		.select({
			id: jobPhoto.id,
			kind: jobPhoto.kind,
			width: jobPhoto.width,
			height: jobPhoto.height
		})
		.from(jobPhoto)
		.where(eq(jobPhoto.jobId, jobId))
		.orderBy(jobPhoto.kind);
}

/**
 * Replaces (with `stored`) or removes (without) the job's photo of one kind. Returns the storage
 * keys of the photo it displaced, which the caller deletes after commit, or a refusal.
 */
export async function setJobPhoto(
	jobId: string,
	ownerId: string,
	kind: PhotoKind,
	stored?: { objectKey: string; thumbKey: string; width: number; height: number; bytes: number }
): Promise<Refusal | { ok: true; displaced: string[] }> {
	return db.transaction(async (tx) => {
		const locked = await lockEditable(tx, jobId, ownerId);
		if (isRefusal(locked)) return locked;
		const [old] = await tx
			.delete(jobPhoto)
			.where(and(eq(jobPhoto.jobId, jobId), eq(jobPhoto.kind, kind)))
			.returning({ objectKey: jobPhoto.objectKey, thumbKey: jobPhoto.thumbKey });
		if (stored) await tx.insert(jobPhoto).values({ jobId, kind, ...stored });
		return { ok: true, displaced: old ? [old.objectKey, old.thumbKey] : [] };
	});
}

export interface Viewer {
	id: string;
	role: 'owner' | 'installer' | 'admin';
}

/**
 * A job photo's storage key when the viewer may see it: the job's owner and admins always;
 * vetted installers once the job is open for quotes or booked (they need the fuse box to quote).
 */
export async function findViewableJobPhoto(
	photoId: string,
	viewer: Viewer,
	isVettedInstaller: (id: string) => Promise<boolean>
): Promise<{ objectKey: string; thumbKey: string } | null> {
	const [row] = await db
		.select({
			objectKey: jobPhoto.objectKey,
			thumbKey: jobPhoto.thumbKey,
			ownerId: job.ownerId,
			status: job.status
		})
		.from(jobPhoto)
		.innerJoin(job, eq(job.id, jobPhoto.jobId))
		.where(eq(jobPhoto.id, photoId));
	if (!row) return null;
	const allowed =
		viewer.role === 'admin' ||
		(viewer.role === 'owner' && row.ownerId === viewer.id) ||
		(viewer.role === 'installer' &&
			(row.status === 'collecting_quotes' || row.status === 'booked') &&
			(await isVettedInstaller(viewer.id)));
	return allowed ? { objectKey: row.objectKey, thumbKey: row.thumbKey } : null;
}

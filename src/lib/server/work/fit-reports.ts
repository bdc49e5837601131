/**
 * The fit report and the install record. Filing stores the photos through the one upload pipeline,
 * then writes the report, its photo rows and the move to 'reported' (with the owner's e-mail) in
 * one transaction through {@link openConfirmationWindow}; when that transaction refuses or fails,
 * the stored photos are removed again. The record is the booking's vehicle, parts and latest
 * report, for its owner, its installer and admins only.
 */
import { and, asc, count, desc, eq } from 'drizzle-orm';
import {
	describeFitReport,
	photoCountProblem,
	toFitReportDetails,
	type FitReportDetails,
	type FitReportForm
} from '$lib/forms/fit-report';
import { stageWords, type FitStageName } from '$lib/work/lifecycle';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { formatInZone } from '$lib/time';
import { openConfirmationWindow } from './completion';
import { db } from '../db';
import {
	booking,
	fitReport,
	fitReportPhoto,
	installerProfile,
	job,
	payment,
	quote,
	user
} from '../db/schema';
import { discardUpload, storeUpload, type StoredUpload } from '../files/uploads';
import { withMail } from '../mail/outbox';
import { refuse, type Refusal } from '../refusal';

export const NOT_YOUR_BOOKING = 'There is no such booking among yours.';

export interface RecordViewer {
	id: string;
	role: 'owner' | 'installer' | 'admin';
}

/** Whether the job fits a rear camera (the report then asks about the demister lines). */
const hasRearCamera = (cameras: string | null) => cameras !== null && cameras !== 'front';

/**
 * The booking as its installer sees it for the report form, or null when it is not theirs.
 * `canReport` says whether a report may be filed now, and `why` why not.
 */
export async function getReportableBooking(bookingId: string, installerId: string) {
	const [row] = await db
		.select({
			id: booking.id,
			status: booking.status,
			stage: booking.stage,
			slotStart: booking.slotStart,
			title: job.title,
			cameras: job.cameras,
			request: job.request,
			timeZone: job.timeZone,
			paidAt: payment.paidAt
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.leftJoin(payment, eq(payment.bookingId, booking.id))
		.where(and(eq(booking.id, bookingId), eq(booking.installerId, installerId)));
	if (!row) return null;
	const paid = row.status === 'confirmed' && row.paidAt !== null;
	const why = !paid
		? 'This booking is not paid and confirmed, so no fit report can be filed yet.'
		: row.stage !== 'to_fit'
			? 'The fit report for this visit is already filed.'
			: null;
	return {
		id: row.id,
		stage: row.stage,
		title: titleOrUntitled(row.title),
		timeZone: row.timeZone,
		slotStart: row.slotStart,
		rearCamera: hasRearCamera(row.cameras),
		fuseFamily: row.request?.fuseFamily ?? null,
		power: row.request?.power ?? null,
		canReport: why === null,
		why
	};
}

/**
 * Files the fit report of a paid booking's visit: only the booking's installer (404 otherwise),
 * only while paid and 'to fit' (409), with one to eight photos (400). The report, its photos and
 * the stage move commit together or not at all.
 * @param form the report as `fitReportSchemaFor(rearCamera)` validated it
 * @param photos the posted files, in the order chosen
 */
export async function fileFitReport(
	bookingId: string,
	installerId: string,
	form: FitReportForm,
	photos: unknown[],
	now = new Date()
): Promise<{ ok: true; reportId: string; visit: number; confirmBy: Date } | Refusal> {
	const found = await getReportableBooking(bookingId, installerId);
	if (!found) return refuse(404, NOT_YOUR_BOOKING);
	if (!found.canReport) return refuse(409, found.why ?? 'No fit report can be filed now.');
	if (form.minutesTaken === undefined) {
		return refuse(400, 'Enter the minutes on the vehicle', {
			fields: { minutesTaken: 'Enter the minutes on the vehicle' }
		});
	}
	const minutesTaken = form.minutesTaken;
	const files = photos.filter((f) => f instanceof File && f.size > 0);
	const countProblem = photoCountProblem(files.length);
	if (countProblem) return refuse(400, countProblem, { fields: { photos: countProblem } });

	const stored: StoredUpload[] = [];
	try {
		for (const [i, file] of files.entries()) {
			const outcome = await storeUpload(file, `fit-reports/${bookingId}`);
			if (!outcome.ok) {
				const problem = `Photo ${String(i + 1)}: ${outcome.problem}`;
				await Promise.all(stored.map(discardUpload));
				return refuse(400, problem, { fields: { photos: problem } });
			}
			stored.push(outcome.stored);
		}
		const details = toFitReportDetails(form, found.rearCamera);
		const result = await withMail(async (tx, mail) => {
			// Locks the booking and checks the move; nothing is written when it refuses.
			const opened = await openConfirmationWindow(tx, mail, bookingId, now);
			if (!opened.ok) return opened;
			const [b] = await tx
				.select({ installerId: booking.installerId })
				.from(booking)
				.where(eq(booking.id, bookingId));
			if (b?.installerId !== installerId) throw new Error('booking changed installer');
			const [{ previous }] = (await tx
				.select({ previous: count() })
				.from(fitReport)
				.where(eq(fitReport.bookingId, bookingId))) as [{ previous: number }];
			const visit = previous + 1;
			const [report] = await tx
				.insert(fitReport)
				.values({
					bookingId,
					visit,
					installerId,
					minutesTaken,
					details,
					notes: form.notes || null,
					filedAt: now
				})
				.returning({ id: fitReport.id });
			await tx.insert(fitReportPhoto).values(
				stored.map((s, position) => ({
					fitReportId: report!.id,
					position,
					objectKey: s.objectKey,
					thumbKey: s.thumbKey ?? s.objectKey,
					width: s.width ?? 0,
					height: s.height ?? 0,
					bytes: s.bytes
				}))
			);
			return { ok: true as const, reportId: report!.id, visit, confirmBy: opened.confirmBy };
		});
		if (!result.ok) await Promise.all(stored.map(discardUpload));
		return result;
	} catch (err) {
		await Promise.all(stored.map(discardUpload));
		throw err;
	}
}

export interface InstallRecord {
	bookingId: string;
	ownerId: string;
	installerId: string;
	stage: FitStageName;
	confirmBy: Date | null;
	title: string;
	timeZone: string;
	vehicle: string;
	ownerName: string;
	businessName: string;
	slotStart: Date;
	parts: { label: string; quantity: number }[];
	report: {
		id: string;
		visit: number;
		filedAt: Date;
		minutesTaken: number;
		notes: string | null;
		details: FitReportDetails;
		photos: { id: string; objectKey: string; width: number; height: number }[];
	} | null;
}

function mayView(viewer: RecordViewer, row: { ownerId: string; installerId: string }) {
	return (
		viewer.role === 'admin' ||
		(viewer.role === 'owner' && row.ownerId === viewer.id) ||
		(viewer.role === 'installer' && row.installerId === viewer.id)
	);
}

/**
 * The install record of a booking with its latest fit report (null before one is filed), or null
 * when there is no such booking or the viewer is neither its owner, its installer nor an admin.
 */
export async function getInstallRecord(
	bookingId: string,
	viewer: RecordViewer
): Promise<InstallRecord | null> {
	const [row] = await db
		.select({
			booking,
			title: job.title,
			timeZone: job.timeZone,
			request: job.request,
			scope: job.scope,
			lines: quote.lines,
			ownerName: user.displayName,
			businessName: installerProfile.businessName
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.innerJoin(quote, eq(quote.id, booking.quoteId))
		.innerJoin(user, eq(user.id, booking.ownerId))
		.innerJoin(installerProfile, eq(installerProfile.userId, booking.installerId))
		.where(eq(booking.id, bookingId));
	if (!row || !mayView(viewer, row.booking)) return null;
	const b = row.booking;
	const [latest] = await db
		.select()
		.from(fitReport)
		.where(eq(fitReport.bookingId, bookingId))
		.orderBy(desc(fitReport.visit))
		.limit(1);
	const photos = latest
		? await db
				.select({
					id: fitReportPhoto.id,
					objectKey: fitReportPhoto.objectKey,
					width: fitReportPhoto.width,
					height: fitReportPhoto.height
				})
				.from(fitReportPhoto)
				.where(eq(fitReportPhoto.fitReportId, latest.id))
				.orderBy(asc(fitReportPhoto.position))
		: [];
	const r = row.request;
	const quotedParts = row.lines
		.filter((l) => l.kind === 'part' || l.kind === 'camera')
		.map((l) => ({ label: l.label, quantity: l.quantity }));
	return {
		bookingId: b.id,
		ownerId: b.ownerId,
		installerId: b.installerId,
		stage: b.stage,
		confirmBy: b.confirmBy,
		title: titleOrUntitled(row.title),
		timeZone: row.timeZone,
		vehicle: r ? `${r.make} ${r.model} ${r.year} (${r.bodyStyle})` : 'Not given',
		ownerName: row.ownerName,
		businessName: row.businessName,
		slotStart: b.slotStart,
		parts:
			quotedParts.length > 0
				? quotedParts
				: (row.scope?.parts ?? []).map((p) => ({ label: p.label, quantity: p.quantity })),
		report: latest
			? {
					id: latest.id,
					visit: latest.visit,
					filedAt: latest.filedAt,
					minutesTaken: latest.minutesTaken,
					notes: latest.notes,
					details: latest.details as FitReportDetails,
					photos
				}
			: null
	};
}

/** A fit-report photo's keys when the viewer may see it (owner, installer, admin), else null. */
export async function findViewableFitReportPhoto(photoId: string, viewer: RecordViewer) {
	const [row] = await db
		.select({
			objectKey: fitReportPhoto.objectKey,
			thumbKey: fitReportPhoto.thumbKey,
			ownerId: booking.ownerId,
			installerId: booking.installerId
		})
		.from(fitReportPhoto)
		.innerJoin(fitReport, eq(fitReport.id, fitReportPhoto.fitReportId))
		.innerJoin(booking, eq(booking.id, fitReport.bookingId))
		.where(eq(fitReportPhoto.id, photoId));
	if (!row || !mayView(viewer, row)) return null;
	return { objectKey: row.objectKey, thumbKey: row.thumbKey };
}

/** The record as plain words for the printable page (days with the year: records are kept). */
export function installRecordView(record: InstallRecord) {
	const day = (d: Date) => formatInZone(d, record.timeZone, 'EEE d MMM yyyy');
	const r = record.report;
	return {
		bookingId: record.bookingId,
		title: record.title,
		vehicle: record.vehicle,
		ownerName: record.ownerName,
		businessName: record.businessName,
		fitDay: day(record.slotStart),
		stage: stageWords(record.stage),
		parts: record.parts,
		report: r && {
			visit: r.visit,
			filedOn: day(r.filedAt),
			minutesTaken: r.minutesTaken,
			notes: r.notes,
			rows: describeFitReport(r.details),
			photoIds: r.photos.map((p) => p.id)
		}
	};
}

export type InstallRecordView = ReturnType<typeof installRecordView>;

// Set-up for the fit notes and calibration tests: reported fits written straight into the tables
// (the fit report form is built and tested elsewhere), and a note input that passes the form.
import { db } from '$lib/server/db';
import { booking, fitReport, job, quote } from '$lib/server/db/schema';
import type { FitNoteInput } from '$lib/forms/fit-note';
import type { JobRequestInput } from '$lib/scope';
import { postedJobColumns } from '$lib/marketplace/posted-job';
import { HATCH_REQUEST, makeOpenJob } from './matching-helpers';
import { eq } from 'drizzle-orm';

let slot = 0;

/**
 * A confirmed booking of `installerId` on a fresh job for `request`, at the 'reported' stage with
 * a first-visit fit report of `minutes`, filed `daysAgo` days ago. No payment rows: nothing here
 * moves money, and the note and calibration read only the booking, job and report.
 */
export async function reportedFit(
	installerId: string,
	request: Partial<JobRequestInput> = {},
	minutes = 120,
	daysAgo = 1
) {
	const made = await makeOpenJob(undefined, { request });
	await db.update(job).set({ status: 'booked' }).where(eq(job.id, made.job.id));
	const [q] = await db
		.insert(quote)
		.values({ jobId: made.job.id, installerId, status: 'accepted', totalCents: 30_000 })
		.returning({ id: quote.id });
	// Slots a day apart in the past, so the installer's bookings never overlap.
	const start = new Date(Date.UTC(2025, 0, 1) + ++slot * 86_400_000);
	const [b] = await db
		.insert(booking)
		.values({
			jobId: made.job.id,
			quoteId: q!.id,
			installerId,
			ownerId: made.ownerId,
			slotStart: start,
			slotEnd: new Date(start.getTime() + 2 * 3_600_000),
			status: 'confirmed',
			holdExpiresAt: start,
			totalCents: 30_000,
			stage: 'reported',
			reportedAt: new Date()
		})
		.returning({ id: booking.id });
	await fileReport(b!.id, installerId, minutes, daysAgo);
	return { bookingId: b!.id, jobId: made.job.id, ownerId: made.ownerId };
}

/** A fit report row for a booking (visit 1 unless said otherwise). */
export async function fileReport(
	bookingId: string,
	installerId: string,
	minutes: number,
	daysAgo = 1,
	visit = 1
) {
	await db.insert(fitReport).values({
		bookingId,
		installerId,
		visit,
		minutesTaken: minutes,
		details: { checked: true },
		filedAt: new Date(Date.now() - daysAgo * 86_400_000)
	});
}

/** The request of a job for an invented car. */
export const carRequest = (
	make: string,
	model: string,
	year: string,
	more: Partial<JobRequestInput> = {}
): JobRequestInput => ({ ...HATCH_REQUEST, make, model, year, ...more });

/** Columns a posted job gets, for checks. */
export { postedJobColumns };

/** A note that passes the form's schema. */
export function noteInput(overrides: Partial<FitNoteInput> = {}): FitNoteInput {
	return {
		make: 'Corvan',
		model: 'Aster',
		yearFrom: 2015,
		yearTo: 2019,
		bodyStyle: 'hatchback',
		fuseFamily: 'mini',
		fuseBoxLocation: "Behind the glovebox, passenger's side",
		fuseBoxAccess: 'Squeeze both glovebox stops and let it drop',
		switchedFuse: 'F23 (accessory socket)',
		switchedRatingAmps: 15,
		permanentFuse: 'F7 (interior light)',
		permanentRatingAmps: 10,
		groundPoints: 'Body bolt on the A-pillar base, 10 mm head',
		trimRemoval: 'A-pillar cover pulls off top first; two clips',
		grommetRoute: 'Tailgate grommet on the left, pull-through wire needed',
		pitfalls: 'F7 stays live about 10 minutes after locking; wait before testing parking mode',
		...overrides
	};
}

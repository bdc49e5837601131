/**
 * What the labour calibration ($lib/marketplace/calibration) and the owners' "fits of this body style" line
 * read: the minutes reported on first visits (a return visit after a dispute is extra work, not
 * the fit) of similar jobs over the last twelve months.
 */
import { and, count, desc, eq, gte } from 'drizzle-orm';
import { db, type Db, type Tx } from '../db';
import { booking, fitReport, job } from '../db/schema';

/** How far back fit times count: a year, so old ways of working and old cars fall away. */
export const CALIBRATION_LOOKBACK_DAYS = 365;

/** At most this many recent fits feed one calibration (plenty for a median; bounds the read). */
const MAX_FITS = 500;

const since = (now: Date) => new Date(now.getTime() - CALIBRATION_LOOKBACK_DAYS * 86_400_000);

/** The job facts calibration groups by. */
export interface SimilarJob {
	bodyStyle: string;
	cameras: string;
	power: string;
}

/**
 * Minutes reported on first visits of jobs with the same body style, cameras and power method,
 * filed in the last year, newest first.
 */
export async function similarFitMinutes(
	similar: SimilarJob,
	now = new Date(),
	q: Db | Tx = db
): Promise<number[]> {
	const rows = await q
		.select({ minutes: fitReport.minutesTaken })
		.from(fitReport)
		.innerJoin(booking, eq(booking.id, fitReport.bookingId))
		.innerJoin(job, eq(job.id, booking.jobId))
		.where(
			and(
				eq(fitReport.visit, 1),
				gte(fitReport.filedAt, since(now)),
				eq(job.bodyStyle, similar.bodyStyle),
				eq(job.cameras, similar.cameras),
				eq(job.power, similar.power)
			)
		)
		.orderBy(desc(fitReport.filedAt))
		.limit(MAX_FITS);
	return rows.map((r) => r.minutes);
}

/** How many fits of this body style Tapline installers reported in the last year. */
export async function countFitsOfBodyStyle(bodyStyle: string, now = new Date()): Promise<number> {
	const [row] = await db
		.select({ n: count() })
		.from(fitReport)
		.innerJoin(booking, eq(booking.id, fitReport.bookingId))
		.innerJoin(job, eq(job.id, booking.jobId))
		.where(
			and(eq(fitReport.visit, 1), gte(fitReport.filedAt, since(now)), eq(job.bodyStyle, bodyStyle))
		);
	return row?.n ?? 0;
}

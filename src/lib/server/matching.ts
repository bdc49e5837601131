/**
 * Which open jobs an installer is offered and which installers a job reaches. PostgreSQL narrows
 * the candidates with a latitude/longitude box over an index (job_status_lat_lng_idx for jobs,
 * installer_profile_lat_lng_idx for installers); turf's great-circle distance then decides, with
 * the skills and working-mode checks of $lib/matching. Installers only ever get a job's grid-cell
 * centre until it is booked with them.
 */
import { maskContactDetails } from '$lib/masking';
import { and, between, eq, gt, inArray, sql } from 'drizzle-orm';
import { z } from 'zod';
import { boundingBox, distanceKm, type BoundingBox, type LatLng } from '$lib/geo';
import {
	approximateLocation,
	matchProblem,
	reachOf,
	type InstallerReach,
	type SkillNeeds
} from '$lib/matching';
import { BOARD_DEFAULT_DIR, BOARD_SORTS, type BoardJob, type BoardSort } from '$lib/board';
import { decodeCursor, pageAfter } from '$lib/paging';
import { BODY_STYLES, CAMERA_SETUPS, POWER_MODES } from '$lib/scope/request';
import { parkingSummary } from '$lib/scope/parking';
import { canQuote } from '$lib/vetting';
import { db } from './db';
import { booking, installerProfile, job, jobNotice, quote, user, type Job } from './db/schema';
import { appUrl } from './mail/app-url';
import { withMail } from './mail/outbox';
import { titleOrUntitled } from '$lib/posted-job';

/** The service-area form's upper limit, so a box this wide around a job holds every installer who could reach it. */
export const MAX_SERVICE_RADIUS_KM = 200;

/** An installer as the matching sees them. */
export interface InstallerContext extends InstallerReach {
	id: string;
	canQuote: boolean;
	pausedReason: string | null;
	vettingStatus: string;
	timeZone: string;
	freeRadiusKm: number;
	travelFeeCentsPerKm: number;
	gstRegistered: boolean;
	/** Payouts set up at the payment provider; quoting needs it. */
	payoutsEnabled: boolean;
}

/** The installer's matching facts, or null before they have a profile. */
export async function getInstallerContext(installerId: string): Promise<InstallerContext | null> {
	const [p] = await db
		.select()
		.from(installerProfile)
		.where(eq(installerProfile.userId, installerId));
	if (!p) return null;
	return {
		id: p.userId,
		...reachOf(p),
		canQuote: canQuote(p),
		pausedReason: p.pausedReason,
		vettingStatus: p.vettingStatus,
		timeZone: p.timeZone,
		freeRadiusKm: p.freeRadiusKm,
		travelFeeCentsPerKm: p.travelFeeCentsPerKm,
		gstRegistered: p.gstRegistered,
		payoutsEnabled: p.payoutsEnabled
	};
}

/** The job's facts for {@link matchProblem}; null while it has no place or request. */
export function jobReach(
	row: Pick<Job, 'latitude' | 'longitude' | 'locationMode' | 'bodyStyle' | 'cameras' | 'power'>
) {
	if (row.latitude === null || row.longitude === null) return null;
	if (!row.bodyStyle || !row.cameras || !row.power) return null;
	return {
		location: { lat: row.latitude, lng: row.longitude },
		locationMode: row.locationMode,
		needs: {
			bodyStyle: row.bodyStyle,
			cameras: row.cameras,
			power: row.power
		} as SkillNeeds
	};
}

/**
 * Vetted, unpaused installers whose circle holds the job and whose skills and way of working fit
 * it, nearest first. SQL keeps installers within the widest possible radius; turf decides.
 * @param jobRow the job's place and needs
 */
export async function findInstallersForJob(
	jobRow: Pick<Job, 'latitude' | 'longitude' | 'locationMode' | 'bodyStyle' | 'cameras' | 'power'>
) {
	const reach = jobReach(jobRow);
	if (!reach) return [];
	const box = boundingBox(reach.location, MAX_SERVICE_RADIUS_KM + CELL_HALF_DIAGONAL_KM);
	const rows = await db
		.select({ profile: installerProfile, email: user.email, displayName: user.displayName })
		.from(installerProfile)
		.innerJoin(user, eq(user.id, installerProfile.userId))
		.where(
			and(
				eq(installerProfile.vettingStatus, 'approved'),
				sql`${installerProfile.pausedReason} is null`,
				between(installerProfile.latitude, box.minLat, box.maxLat),
				between(installerProfile.longitude, box.minLng, box.maxLng)
			)
		);
	return rows
		.map((r) => ({
			id: r.profile.userId,
			email: r.email,
			displayName: r.displayName,
			businessName: r.profile.businessName,
			distanceKm: distanceKm(reach.location, { lat: r.profile.latitude, lng: r.profile.longitude }),
			problem: matchProblem(reach, reachOf(r.profile))
		}))
		.filter((r) => r.problem === null)
		.sort((a, b) => a.distanceKm - b.distanceKm)
		.map(({ problem: _problem, ...r }) => r);
}

const bounds = z.string().transform((s, ctx) => {
	const parts = s.split(',').map(Number);
	const [minLng, minLat, maxLng, maxLat] = parts;
	if (
		parts.length !== 4 ||
		parts.some((n) => !Number.isFinite(n)) ||
		minLng === undefined ||
		minLat === undefined ||
		maxLng === undefined ||
		maxLat === undefined ||
		minLat < -90 ||
		maxLat > 90 ||
		minLat > maxLat ||
		minLng > maxLng
	) {
		ctx.addIssue({
			code: 'custom',
			message:
				'bounds must be minLng,minLat,maxLng,maxLat in decimal degrees, south-west corner first'
		});
		return z.NEVER;
	}
	return { minLat, maxLat, minLng, maxLng } satisfies BoundingBox;
});

/** Query parameters of GET /api/jobs, validated; see the README for each. */
export const boardQuerySchema = z.object({
	bounds: bounds.optional(),
	bodyStyle: z
		.enum(BODY_STYLES, { error: `bodyStyle must be one of ${BODY_STYLES.join(', ')}` })
		.optional(),
	cameras: z
		.enum(CAMERA_SETUPS, { error: `cameras must be one of ${CAMERA_SETUPS.join(', ')}` })
		.optional(),
	power: z
		.enum(POWER_MODES, { error: `power must be one of ${POWER_MODES.join(', ')}` })
		.optional(),
	maxKm: z.coerce
		.number({ error: 'maxKm must be a number of kilometres' })
		.positive({ error: 'maxKm must be above 0' })
		.max(MAX_SERVICE_RADIUS_KM, { error: `maxKm must be at most ${String(MAX_SERVICE_RADIUS_KM)}` })
		.optional(),
	unquoted: z.enum(['1', 'true'], { error: 'unquoted must be 1 or true' }).optional(),
	sort: z
		.enum(BOARD_SORTS, { error: `sort must be one of ${BOARD_SORTS.join(', ')}` })
		.default('distance'),
	dir: z.enum(['asc', 'desc'], { error: 'dir must be asc or desc' }).optional(),
	cursor: z.string().max(500).optional(),
	limit: z.coerce
		.number({ error: 'limit must be a whole number' })
		.int({ error: 'limit must be a whole number' })
		.min(1, { error: 'limit must be between 1 and 100' })
		.max(100, { error: 'limit must be between 1 and 100' })
		.default(25)
});
export type BoardQuery = z.output<typeof boardQuerySchema>;

/**
 * Offering goes by a job's 1 km grid-cell centre, which lies within the cell's half-diagonal
 * (≈ 0.71 km, see snapToGrid) of its exact point; the SQL boxes on the exact columns are widened
 * by this much so no job whose centre qualifies is cut off by its exact point.
 */
const CELL_HALF_DIAGONAL_KM = 0.75;
/** The same margin for a map's bounds, in degrees (0.02° ≥ 1.8 km in longitude at Adelaide's latitude). */
const MAP_BOUNDS_MARGIN_DEGREES = 0.02;

const widen = (b: BoundingBox, by: number): BoundingBox => ({
	minLat: b.minLat - by,
	maxLat: b.maxLat + by,
	minLng: b.minLng - by,
	maxLng: b.maxLng + by
});

function intersect(a: BoundingBox, b: BoundingBox): BoundingBox | null {
	const box = {
		minLat: Math.max(a.minLat, b.minLat),
		maxLat: Math.min(a.maxLat, b.maxLat),
		minLng: Math.max(a.minLng, b.minLng),
		maxLng: Math.min(a.maxLng, b.maxLng)
	};
	return box.minLat > box.maxLat || box.minLng > box.maxLng ? null : box;
}

function summarise(row: Pick<Job, 'scope'>): string {
	const scope = row.scope;
	if (!scope) return '';
	const parts = scope.parts.reduce((n, p) => n + p.quantity, 0);
	const rear = scope.rearCable ? `, rear cable ${String(scope.rearCable.maxMetres)} m` : '';
	const parking = scope.parking ? `, ${parkingSummary(scope.parking)}` : '';
	return `${String(scope.labour.minMinutes)}–${String(scope.labour.maxMinutes)} min, ${String(parts)} parts${rear}${parking}`;
}

/**
 * Every open job offered to the installer within `box` (or their whole circle), with what the
 * board shows. The SQL box is the service circle's bounding box, cut down to the map's bounds.
 */
export async function listOfferedJobs(installer: InstallerContext, box?: BoundingBox) {
	const circleBox = boundingBox(installer.base, installer.serviceRadiusKm + CELL_HALF_DIAGONAL_KM);
	const searchBox = box ? intersect(circleBox, widen(box, MAP_BOUNDS_MARGIN_DEGREES)) : circleBox;
	if (!searchBox) return [];
	const liveQuotes = db.$count(quote, and(eq(quote.jobId, job.id), eq(quote.status, 'live')));
	const rows = await db
		.select({
			id: job.id,
			title: job.title,
			suburb: job.suburb,
			latitude: job.latitude,
			longitude: job.longitude,
			locationMode: job.locationMode,
			bodyStyle: job.bodyStyle,
			cameras: job.cameras,
			power: job.power,
			preferredWindows: job.preferredWindows,
			scope: job.scope,
			priceLowCents: job.priceLowCents,
			priceHighCents: job.priceHighCents,
			submittedAt: job.submittedAt,
			createdAt: job.createdAt,
			quotes: liveQuotes,
			myQuote: quote.status
		})
		.from(job)
		.leftJoin(quote, and(eq(quote.jobId, job.id), eq(quote.installerId, installer.id)))
		.where(
			and(
				eq(job.status, 'collecting_quotes'),
				between(job.latitude, searchBox.minLat, searchBox.maxLat),
				between(job.longitude, searchBox.minLng, searchBox.maxLng)
			)
		);
	const offered: BoardJob[] = [];
	for (const row of rows) {
		const reach = jobReach(row);
		if (!reach || matchProblem(reach, installer) !== null) continue;
		const approx = approximateLocation(reach.location, installer.base);
		// The map's bounds cut on the cell centre the installer sees, not the hidden true point.
		if (
			box &&
			!(
				approx.lat >= box.minLat &&
				approx.lat <= box.maxLat &&
				approx.lng >= box.minLng &&
				approx.lng <= box.maxLng
			)
		) {
			continue;
		}
		offered.push({
			id: row.id,
			title: titleOrUntitled(row.title),
			suburb: row.suburb,
			lat: approx.lat,
			lng: approx.lng,
			distanceKm: approx.distanceKm,
			bodyStyle: reach.needs.bodyStyle,
			cameras: reach.needs.cameras,
			power: reach.needs.power,
			locationMode: row.locationMode,
			preferredWindows: row.preferredWindows,
			scopeSummary: summarise(row),
			priceGuide:
				row.priceLowCents !== null && row.priceHighCents !== null
					? { lowCents: row.priceLowCents, highCents: row.priceHighCents }
					: null,
			quotes: row.quotes,
			myQuote: row.myQuote,
			postedAt: (row.submittedAt ?? row.createdAt).toISOString()
		});
	}
	return offered;
}

/**
 * One page of the board for GET /api/jobs: offered jobs in the bounds, filtered, sorted and
 * paged with a keyset cursor on (sort value, id), so pages never repeat or skip a job while the
 * list is stable.
 * @returns null when the cursor is not one this API made
 */
export async function searchBoard(installer: InstallerContext, query: BoardQuery) {
	const after = query.cursor ? decodeCursor(query.cursor) : null;
	if (query.cursor && !after) return null;
	const all = (await listOfferedJobs(installer, query.bounds)).filter(
		(j) =>
			(!query.bodyStyle || j.bodyStyle === query.bodyStyle) &&
			(!query.cameras || j.cameras === query.cameras) &&
			(!query.power || j.power === query.power) &&
			(query.maxKm === undefined || j.distanceKm <= query.maxKm) &&
			(!query.unquoted || j.myQuote === null)
	);
	const keys: Record<BoardSort, (j: BoardJob) => number | string> = {
		distance: (j) => j.distanceKm,
		newest: (j) => j.postedAt,
		date: (j) => j.preferredWindows.map((w) => w.date).sort()[0] ?? '9999-12-31',
		quotes: (j) => j.quotes
	};
	const dir = query.dir ?? BOARD_DEFAULT_DIR[query.sort];
	const { page, nextCursor } = pageAfter(all, keys[query.sort], dir, after, query.limit);
	return { jobs: page, nextCursor, total: all.length };
}

/** Open jobs offered to the installer posted in the last `days` days that they have not quoted. */
export async function listNewOfferedJobs(installer: InstallerContext, days = 7, now = new Date()) {
	const since = now.getTime() - days * 86_400_000;
	return (await listOfferedJobs(installer))
		.filter((j) => j.myQuote === null && new Date(j.postedAt).getTime() >= since)
		.sort((a, b) => b.postedAt.localeCompare(a.postedAt));
}

/** What an installer may see of one job, and whether it is booked with them. */
export async function getJobForInstaller(jobId: string, installer: InstallerContext) {
	const [row] = await db
		.select({ job, ownerName: user.displayName })
		.from(job)
		.innerJoin(user, eq(user.id, job.ownerId))
		.where(eq(job.id, jobId));
	if (!row) return null;
	const [mine] = await db
		.select({
			id: booking.id,
			slotStart: booking.slotStart,
			slotEnd: booking.slotEnd,
			status: booking.status,
			holdExpiresAt: booking.holdExpiresAt
		})
		.from(booking)
		.where(
			and(
				eq(booking.jobId, jobId),
				eq(booking.installerId, installer.id),
				inArray(booking.status, ['awaiting_payment', 'confirmed'])
			)
		);
	const [myQuote] = await db
		.select()
		.from(quote)
		.where(and(eq(quote.jobId, jobId), eq(quote.installerId, installer.id)));
	const reach = jobReach(row.job);
	if (!reach) return null;
	const problem = matchProblem(reach, installer);
	const open = row.job.status === 'collecting_quotes';
	if (!mine && !myQuote && !(open && problem === null && installer.canQuote)) return null;
	const j = row.job;
	const approx = approximateLocation(reach.location, installer.base);
	const [counted] = await db
		.select({ n: sql<number>`count(*)::int` })
		.from(quote)
		.where(and(eq(quote.jobId, jobId), eq(quote.status, 'live')));
	return {
		id: j.id,
		status: j.status,
		title: titleOrUntitled(j.title),
		suburb: j.suburb,
		postcode: j.postcode,
		approx,
		locationMode: j.locationMode,
		preferredWindows: j.preferredWindows,
		// The owner's note passes unmasked only once a booking with this installer is paid for.
		ownerNote:
			j.ownerNote === null
				? null
				: mine?.status === 'confirmed'
					? j.ownerNote
					: maskContactDetails(j.ownerNote).text,
		scope: j.scope,
		request: j.request,
		timeZone: j.timeZone,
		quotes: counted?.n ?? 0,
		problem,
		myQuote: myQuote ?? null,
		booking: mine ?? null,
		// Only once a booking with this installer is confirmed by payment: who and where exactly.
		// A provisional booking reveals nothing; its hold may lapse and the job open again.
		revealed:
			mine?.status === 'confirmed'
				? {
						ownerName: row.ownerName,
						addressLine: j.addressLine,
						exact: { lat: reach.location.lat, lng: reach.location.lng } satisfies LatLng
					}
				: null
	};
}

/** How far back the new-job digest looks: jobs posted longer ago are old news. */
const DIGEST_LOOKBACK_DAYS = 14;

/**
 * E-mails each vetted installer one digest of the open jobs offered to them that they have not
 * been told about yet (job_notice), then records the notices, in one transaction per installer.
 * Idempotent: a job is in at most one digest per installer, so a retry sends nothing twice.
 * @returns how many installers were e-mailed
 */
export async function sendNewJobDigests(now = new Date()): Promise<number> {
	const since = new Date(now.getTime() - DIGEST_LOOKBACK_DAYS * 86_400_000);
	const open = await db
		.select()
		.from(job)
		.where(and(eq(job.status, 'collecting_quotes'), gt(job.submittedAt, since)));
	type DigestJob = { jobId: string; title: string; suburb: string; distance: string };
	const byInstaller = new Map<string, { email: string; displayName: string; jobs: DigestJob[] }>();
	for (const row of open) {
		const reach = jobReach(row);
		if (!reach) continue;
		for (const installer of await findInstallersForJob(row)) {
			const entry = byInstaller.get(installer.id) ?? {
				email: installer.email,
				displayName: installer.displayName,
				jobs: []
			};
			entry.jobs.push({
				jobId: row.id,
				title: titleOrUntitled(row.title),
				suburb: row.suburb ?? 'nearby',
				distance: `${String(Math.round(installer.distanceKm))} km`
			});
			byInstaller.set(installer.id, entry);
		}
	}
	let sent = 0;
	for (const [installerId, entry] of byInstaller) {
		await withMail(async (tx, mail) => {
			const fresh = await tx
				.insert(jobNotice)
				.values(entry.jobs.map((j) => ({ installerId, jobId: j.jobId, noticedAt: now })))
				.onConflictDoNothing()
				.returning({ jobId: jobNotice.jobId });
			const quoted = await tx
				.select({ jobId: quote.jobId })
				.from(quote)
				.where(eq(quote.installerId, installerId));
			const jobs = entry.jobs.filter(
				(j) => fresh.some((f) => f.jobId === j.jobId) && !quoted.some((q) => q.jobId === j.jobId)
			);
			if (jobs.length === 0) return;
			await mail.send(entry.email, {
				template: 'new-jobs-digest',
				data: {
					displayName: entry.displayName,
					jobs: jobs.map(({ title, suburb, distance }) => ({ title, suburb, distance })),
					url: appUrl('/installer/jobs')
				}
			});
			sent++;
		});
	}
	return sent;
}

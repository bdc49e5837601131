/**
 * Which open jobs an installer is offered and which installers a job reaches, decided in
 * PostgreSQL with PostGIS: ST_DWithin on the GiST indexes of the job's cell point
 * (`job.approx_location`) and the installer's base (`installer_profile.base`), on the sphere of
 * $lib/geo's one distance model (`use_spheroid => false`); skills (`job.required_skills`, written
 * at posting) and working mode as SQL predicates; every filter of GET /api/jobs in SQL; keyset
 * paging on (sort key, id); nearest first with the KNN operator `<->`; live quote counts from
 * `job.live_quotes` (a trigger keeps it in the quote's transaction). The pure rule these mirror is
 * matchProblem in $lib/marketplace/matching, and tests/integration/board.test.ts holds the two equal.
 * Installers only ever get a job's grid-cell centre until it is booked with them.
 */
import { maskContactDetails } from '$lib/masking';
import { and, eq, inArray, sql } from 'drizzle-orm';
import { shownKm, type BoundingBox, type LatLng } from '$lib/geo';
import {
	boardClustersSql,
	boardPageSql,
	boardQuerySchema,
	boardTotalSql,
	REACHES,
	type BoardQuery,
	type BoardSqlQuery
} from './board-sql';
import {
	approximateLocation,
	matchProblem,
	reachOf,
	type InstallerReach,
	type SkillNeeds
} from '$lib/marketplace/matching';
import type { BoardCluster, BoardJob } from '$lib/marketplace/board';
import { encodeCursor } from '$lib/paging';
import { canQuote } from '$lib/people/vetting';
import { db } from '../db';
import { booking, installerProfile, job, quote, user, type Job } from '../db/schema';
import { appUrl } from '../mail/app-url';
import { withMail } from '../mail/outbox';
import { scopeSummary, titleOrUntitled } from '$lib/marketplace/posted-job';
import type { ScopeSheet } from '$lib/scope';

export { boardQuerySchema, type BoardQuery } from './board-sql';

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
 * Vetted, unpaused installers whose circle holds the job's cell centre and whose skills and way of
 * working fit it, nearest first: one query over the GiST index on the installers' bases.
 * @param jobRow the job (its id is enough)
 */
export async function findInstallersForJob(jobRow: Pick<Job, 'id'>) {
	const { rows } = await db.execute<{
		id: string;
		email: string;
		display_name: string;
		business_name: string;
		distance_m: number;
	}>(sql`select p.user_id as id, u.email, u.display_name, p.business_name,
			p.base <-> j.approx_location as distance_m
		from job j
		join installer_profile p on ${REACHES}
		join "user" u on u.id = p.user_id
		where j.id = ${jobRow.id}
		order by distance_m, p.user_id`);
	return rows.map((r) => ({
		id: r.id,
		email: r.email,
		displayName: r.display_name,
		businessName: r.business_name,
		distanceKm: shownKm(r.distance_m)
	}));
}

/** A board row as the page query returns it. */
interface BoardRow extends Record<string, unknown> {
	id: string;
	title: string | null;
	suburb: string | null;
	lat: number;
	lng: number;
	distance_m: number;
	body_style: string;
	cameras: string;
	power: string;
	location_mode: 'mobile' | 'workshop' | null;
	preferred_windows: Array<{ date: string; window: string }>;
	scope_summary: string | null;
	legacy_scope: ScopeSheet | null;
	price_low_cents: number | null;
	price_high_cents: number | null;
	live_quotes: number;
	my_quote: string | null;
	posted_at: Date;
	sort_value: number | string;
}

function toBoardJob(r: BoardRow): BoardJob {
	return {
		id: r.id,
		title: titleOrUntitled(r.title),
		suburb: r.suburb,
		lat: r.lat,
		lng: r.lng,
		distanceKm: shownKm(r.distance_m),
		bodyStyle: r.body_style,
		cameras: r.cameras,
		power: r.power,
		locationMode: r.location_mode,
		preferredWindows: r.preferred_windows,
		// Jobs posted before the summary column existed carry their scope instead (page rows only).
		scopeSummary: r.scope_summary ?? (r.legacy_scope ? scopeSummary(r.legacy_scope) : ''),
		priceGuide:
			r.price_low_cents !== null && r.price_high_cents !== null
				? { lowCents: r.price_low_cents, highCents: r.price_high_cents }
				: null,
		quotes: r.live_quotes,
		myQuote: r.my_quote,
		postedAt: new Date(r.posted_at).toISOString()
	};
}

/**
 * One page of offered jobs (see boardPageSql).
 * @returns null when the cursor is not one this API made for this sort
 */
async function boardPage(installer: InstallerContext, query: BoardQuery & { postedSince?: Date }) {
	const statement = boardPageSql(installer, query);
	if (!statement) return null;
	const { rows } = await db.execute<BoardRow>(statement);
	const more = rows.length > query.limit;
	const pageRows = rows.slice(0, query.limit);
	const last = pageRows.at(-1);
	return {
		jobs: pageRows.map(toBoardJob),
		nextCursor: more && last ? encodeCursor(last.sort_value, last.id) : null
	};
}

/** The map's clusters for the view (see boardClustersSql). */
async function boardClusters(
	installer: InstallerContext,
	query: BoardQuery,
	zoom: number
): Promise<BoardCluster[]> {
	const { rows } = await db.execute<{
		count: number;
		lat: number;
		lng: number;
		job_id: string | null;
		title: string | null;
	}>(boardClustersSql(installer, query, zoom));
	return rows.map((r) => ({
		lat: r.lat,
		lng: r.lng,
		count: r.count,
		job: r.job_id ? { id: r.job_id, title: titleOrUntitled(r.title) } : null
	}));
}

/** How many offered jobs match the query (see boardTotalSql). */
async function boardTotal(installer: InstallerContext, query: BoardSqlQuery): Promise<number> {
	const { rows } = await db.execute<{ n: number }>(boardTotalSql(installer, query));
	return rows[0]?.n ?? 0;
}

/**
 * One page of the board for GET /api/jobs and the board page: offered jobs in the bounds,
 * filtered, sorted and paged with a keyset cursor on (sort value, id), so pages never repeat or
 * skip a job while the list is stable. With `zoom`, also the map's clusters for the whole view,
 * whose counts give the total; without, the total is counted on a first page only (`counted`
 * false skips even that: the board page's first paint leaves it to the browser).
 * @returns null when the cursor is not one this API made
 */
export async function searchBoard(
	installer: InstallerContext,
	query: BoardQuery,
	options: { counted?: boolean } = {}
) {
	const counted = options.counted ?? true;
	const [page, clusters, total] = await Promise.all([
		boardPage(installer, query),
		query.zoom === undefined ? null : boardClusters(installer, query, query.zoom),
		query.zoom !== undefined || query.cursor || !counted ? null : boardTotal(installer, query)
	]);
	if (!page) return null;
	return {
		jobs: page.jobs,
		nextCursor: page.nextCursor,
		total: clusters ? clusters.reduce((n, c) => n + c.count, 0) : total,
		clusters
	};
}

/**
 * Every open job offered to the installer within `box` (or their whole circle), nearest first,
 * unpaged: for tests and small checks that compare the SQL with the pure rule; pages use
 * {@link searchBoard}.
 */
export async function listOfferedJobs(installer: InstallerContext, box?: BoundingBox) {
	const all: BoardJob[] = [];
	let cursor: string | undefined;
	do {
		const page = await boardPage(installer, {
			...boardQuerySchema.parse({ limit: '100', cursor }),
			bounds: box
		});
		if (!page) break;
		all.push(...page.jobs);
		cursor = page.nextCursor ?? undefined;
	} while (cursor);
	return all;
}

/**
 * The newest open jobs offered to the installer that they have not quoted, posted in the last
 * `days` days: one page of the "newest" sort with a date limit in SQL, and with `counted` how
 * many there are in all (one count on the circle's index).
 */
export async function listNewOfferedJobs(
	installer: InstallerContext,
	options: { days?: number; limit?: number; now?: Date; counted?: boolean } = {}
) {
	const postedSince = new Date(
		(options.now ?? new Date()).getTime() - (options.days ?? 7) * 86_400_000
	);
	const query = {
		...boardQuerySchema.parse({ sort: 'newest', unquoted: '1', limit: String(options.limit ?? 8) }),
		postedSince
	};
	const [page, total] = await Promise.all([
		boardPage(installer, query),
		options.counted ? boardTotal(installer, query) : null
	]);
	return { jobs: page?.jobs ?? [], total };
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
			holdExpiresAt: booking.holdExpiresAt,
			stage: booking.stage
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
		quotes: j.liveQuotes,
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
 * been told about yet (job_notice) and have not quoted. The matching is one set-based query over
 * every recent job and installer (the GiST index on the installers' bases); the notices and the
 * e-mails are then written in one transaction. Idempotent: the notices are inserted first with
 * ON CONFLICT DO NOTHING, and only pairs that insert count, so a retry sends nothing twice.
 * @returns how many installers were e-mailed
 */
export async function sendNewJobDigests(now = new Date()): Promise<number> {
	const since = new Date(now.getTime() - DIGEST_LOOKBACK_DAYS * 86_400_000);
	return withMail(async (tx, mail) => {
		const { rows } = await tx.execute<{
			installer_id: string;
			email: string;
			display_name: string;
			job_id: string;
			title: string | null;
			suburb: string | null;
			distance_m: number;
		}>(sql`with offered as (
				select p.user_id as installer_id, j.id as job_id, p.base <-> j.approx_location as distance_m
				from job j
				join installer_profile p on ${REACHES}
				where j.status = 'collecting_quotes' and j.submitted_at > ${since.toISOString()}::timestamptz
					and not exists (select 1 from quote q where q.job_id = j.id and q.installer_id = p.user_id)
			), fresh as (
				insert into job_notice (installer_id, job_id, created_at)
				select installer_id, job_id, ${now.toISOString()}::timestamptz from offered
				on conflict do nothing
				returning installer_id, job_id
			)
			select f.installer_id, u.email, u.display_name, j.id as job_id, j.title, j.suburb, o.distance_m
			from fresh f
			join offered o on o.installer_id = f.installer_id and o.job_id = f.job_id
			join job j on j.id = f.job_id
			join "user" u on u.id = f.installer_id
			order by f.installer_id, o.distance_m, j.id`);
		type DigestJob = { title: string; suburb: string; distance: string };
		const byInstaller = new Map<
			string,
			{ email: string; displayName: string; jobs: DigestJob[] }
		>();
		for (const r of rows) {
			const entry = byInstaller.get(r.installer_id) ?? {
				email: r.email,
				displayName: r.display_name,
				jobs: []
			};
			entry.jobs.push({
				title: titleOrUntitled(r.title),
				suburb: r.suburb ?? 'nearby',
				distance: `${shownKm(r.distance_m).toFixed(1)} km`
			});
			byInstaller.set(r.installer_id, entry);
		}
		for (const entry of byInstaller.values()) {
			await mail.send(entry.email, {
				template: 'new-jobs-digest',
				data: { displayName: entry.displayName, jobs: entry.jobs, url: appUrl('/installer/jobs') }
			});
		}
		return byInstaller.size;
	});
}

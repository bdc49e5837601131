/**
 * Which open jobs an installer is offered and which installers a job reaches, decided in
 * PostgreSQL with PostGIS: ST_DWithin on the GiST indexes of the job's cell point
 * (`job.approx_location`) and the installer's base (`installer_profile.base`), on the sphere of
 * $lib/geo's one distance model (`use_spheroid => false`); skills (`job.required_skills`, written
 * at posting) and working mode as SQL predicates; every filter of GET /api/jobs in SQL; keyset
 * paging on (sort key, id); nearest first with the KNN operator `<->`; live quote counts from
 * `job.live_quotes` (a trigger keeps it in the quote's transaction). The pure rule these mirror is
 * matchProblem in $lib/matching, and tests/integration/board.test.ts holds the two equal.
 * Installers only ever get a job's grid-cell centre until it is booked with them.
 */
import { and, eq, inArray, sql, type SQL } from 'drizzle-orm';
import { z } from 'zod';
import { distanceKm, shownKm, type BoundingBox, type LatLng } from '$lib/geo';
import {
	approximateLocation,
	matchProblem,
	reachOf,
	type InstallerReach,
	type SkillNeeds
} from '$lib/matching';
import {
	BOARD_DEFAULT_DIR,
	BOARD_SORTS,
	MAX_CLUSTER_CELLS_ACROSS,
	type BoardCluster,
	type BoardJob,
	type BoardSort
} from '$lib/board';
import { decodeCursor, encodeCursor } from '$lib/paging';
import { BODY_STYLES, CAMERA_SETUPS, POWER_MODES } from '$lib/scope/request';
import { canQuote } from '$lib/vetting';
import { db } from './db';
import { booking, installerProfile, job, quote, user, type Job } from './db/schema';
import { appUrl } from './mail/app-url';
import { withMail } from './mail/outbox';
import { scopeSummary, titleOrUntitled } from '$lib/posted-job';
import type { ScopeSheet } from '$lib/scope';

/** The service-area form's upper limit, so a circle this wide around a job holds every installer who could reach it. */
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
		gstRegistered: p.gstRegistered
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

/** A point as PostGIS geography (longitude first, as PostGIS orders it). */
const geography = (p: LatLng): SQL =>
	sql`st_setsrid(st_makepoint(${p.lng}::float8, ${p.lat}::float8), 4326)::geography`;

/** A PostgreSQL text[] literal, so a list travels as one parameter. */
function textArray(values: readonly string[]): string {
	return `{${values.map((v) => `"${v.replace(/["\\]/g, '\\$&')}"`).join(',')}}`;
}

/**
 * The SQL form of matchProblem for one installer, over `job` aliased `j`: open, cell centre inside
 * the circle (inclusive), skills covered, working mode offered. A job without a place or request
 * has a null cell point or null skills and so never matches, as jobReach gives null for it.
 */
function offeredTo(installer: InstallerReach): SQL {
	return sql`j.status = 'collecting_quotes'
		and st_dwithin(j.approx_location, ${geography(installer.base)}, ${installer.serviceRadiusKm * 1000}::float8, false)
		and j.required_skills <@ ${textArray(installer.skills)}::text[]
		and (j.location_mode is null
			or (j.location_mode = 'mobile' and ${installer.offersMobile}::boolean)
			or (j.location_mode = 'workshop' and ${installer.offersWorkshop}::boolean))`;
}

/**
 * The same rule from the installer's side, joining `installer_profile` aliased `p` to `job` `j`:
 * the first ST_DWithin (the largest radius allowed) can use the GiST index on either point, the
 * second is the installer's own circle.
 */
const REACHES = sql`st_dwithin(p.base, j.approx_location, ${sql.raw(String(MAX_SERVICE_RADIUS_KM * 1000))}, false)
	and st_dwithin(p.base, j.approx_location, p.service_radius_km * 1000.0, false)
	and p.vetting_status = 'approved' and p.paused_reason is null
	and j.required_skills <@ p.skills
	and (j.location_mode is null
		or (j.location_mode = 'mobile' and p.offers_mobile)
		or (j.location_mode = 'workshop' and p.offers_workshop))`;

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
		.default(25),
	zoom: z.coerce
		.number({ error: 'zoom must be a whole number from 0 to 22' })
		.int({ error: 'zoom must be a whole number from 0 to 22' })
		.min(0, { error: 'zoom must be a whole number from 0 to 22' })
		.max(22, { error: 'zoom must be a whole number from 0 to 22' })
		.optional()
});
export type BoardQuery = z.output<typeof boardQuerySchema>;

/**
 * The map's bounds as SQL on the cell centre the installer sees, never the hidden true point: the
 * exact latitude/longitude test, plus a circle round the box (centre to farthest corner, in the
 * one distance model) that lets PostgreSQL use the GiST index for a small view.
 */
function inBounds(box: BoundingBox): SQL {
	const exact = sql`j.cell_latitude between ${box.minLat}::float8 and ${box.maxLat}::float8
		and j.cell_longitude between ${box.minLng}::float8 and ${box.maxLng}::float8`;
	if (box.maxLng - box.minLng > 90 || box.maxLat - box.minLat > 90) return exact;
	const centre = { lat: (box.minLat + box.maxLat) / 2, lng: (box.minLng + box.maxLng) / 2 };
	const reach = Math.max(
		...[box.minLat, box.maxLat].flatMap((lat) =>
			[box.minLng, box.maxLng].map((lng) => distanceKm(centre, { lat, lng }))
		)
	);
	// One metre over the farthest corner covers float rounding; the exact test above decides.
	return sql`${exact} and st_dwithin(j.approx_location, ${geography(centre)}, ${reach * 1000 + 1}::float8, false)`;
}

/** Every condition of a board query but the cursor: the installer's offer and the filters. */
function boardWhere(installer: InstallerContext, query: Omit<BoardQuery, 'sort' | 'limit'>): SQL {
	const parts = [offeredTo(installer)];
	if (query.bodyStyle) parts.push(sql`j.body_style = ${query.bodyStyle}`);
	if (query.cameras) parts.push(sql`j.cameras = ${query.cameras}`);
	if (query.power) parts.push(sql`j.power = ${query.power}`);
	if (query.maxKm !== undefined) {
		parts.push(
			sql`st_dwithin(j.approx_location, ${geography(installer.base)}, ${query.maxKm * 1000}::float8, false)`
		);
	}
	if (query.unquoted) {
		parts.push(
			sql`not exists (select 1 from quote q where q.job_id = j.id and q.installer_id = ${installer.id})`
		);
	}
	if (query.bounds) parts.push(inBounds(query.bounds));
	return sql.join(parts, sql` and `);
}

/** Each sort's key in SQL, and how a cursor's value is checked and typed for it. */
const SORT_KEYS: Record<
	BoardSort,
	{ key: (base: SQL) => SQL; value: (v: unknown) => SQL | null; out: (base: SQL) => SQL }
> = {
	distance: {
		key: (base) => sql`(j.approx_location <-> ${base})`,
		value: (v) => (typeof v === 'number' && Number.isFinite(v) ? sql`${v}::float8` : null),
		out: (base) => sql`(j.approx_location <-> ${base})`
	},
	newest: {
		key: () => sql`j.submitted_at`,
		// Sent as PostgreSQL's own text of the timestamp, so microseconds survive the round trip.
		value: (v) =>
			typeof v === 'string' &&
			/^\d{4}-\d{2}-\d{2} \d{2}:\d{2}:\d{2}(\.\d{1,6})?[+-]\d{2}(:\d{2})?$/.test(v)
				? sql`${v}::timestamptz`
				: null,
		out: () => sql`j.submitted_at::text`
	},
	date: {
		key: () => sql`j.earliest_date`,
		value: (v) => (typeof v === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(v) ? sql`${v}::text` : null),
		out: () => sql`j.earliest_date`
	},
	quotes: {
		key: () => sql`j.live_quotes`,
		value: (v) => (typeof v === 'number' && Number.isInteger(v) ? sql`${v}::int` : null),
		out: () => sql`j.live_quotes`
	}
};

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

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
 * One page of offered jobs, filtered, sorted and paged in SQL: keyset on (sort key, id), the id
 * running the same way as the key, so the page is a range of an index (the KNN scan for
 * distance, a btree for the others) and costs the page, not the market.
 * @returns null when the cursor is not one this API made for this sort
 */
async function boardPage(installer: InstallerContext, query: BoardQuery) {
	const sort = SORT_KEYS[query.sort];
	const dir = query.dir ?? BOARD_DEFAULT_DIR[query.sort];
	const base = geography(installer.base);
	const conditions = [boardWhere(installer, query)];
	if (query.cursor) {
		const after = decodeCursor(query.cursor);
		const value = after ? sort.value(after.value) : null;
		if (!after || !value || !UUID.test(after.id)) return null;
		conditions.push(
			dir === 'asc'
				? sql`(${sort.key(base)}, j.id) > (${value}, ${after.id}::uuid)`
				: sql`(${sort.key(base)}, j.id) < (${value}, ${after.id}::uuid)`
		);
	}
	const order = dir === 'asc' ? sql`asc` : sql`desc`;
	// The inner query finds the page on an index; the outer one reads the rest for those rows only.
	const { rows } = await db.execute<BoardRow>(sql`
		select page.*,
			(select q.status from quote q where q.job_id = page.id and q.installer_id = ${installer.id}) as my_quote,
			case when page.scope_summary is null then (select scope from job where id = page.id) end as legacy_scope
		from (
			select j.id, j.title, j.suburb, j.cell_latitude as lat, j.cell_longitude as lng,
				(j.approx_location <-> ${base}) as distance_m,
				j.body_style, j.cameras, j.power, j.location_mode, j.preferred_windows, j.scope_summary,
				j.price_low_cents, j.price_high_cents, j.live_quotes,
				coalesce(j.submitted_at, j.created_at) as posted_at,
				${sort.out(base)} as sort_value
			from job j
			where ${sql.join(conditions, sql` and `)}
			order by ${sort.key(base)} ${order}, j.id ${order}
			limit ${query.limit + 1}
		) page
		order by ${query.sort === 'distance' ? sql`page.distance_m` : sql`page.sort_value`} ${order}, page.id ${order}`);
	const more = rows.length > query.limit;
	const pageRows = rows.slice(0, query.limit);
	const last = pageRows.at(-1);
	return {
		jobs: pageRows.map(toBoardJob),
		nextCursor: more && last ? encodeCursor(last.sort_value, last.id) : null
	};
}

/**
 * The map's markers for a view: offered jobs (after the filters) gathered in SQL into a grid of
 * at most MAX_CLUSTER_CELLS_ACROSS² cells over the view (or the service circle), each cell about
 * 64 screen pixels at the zoom given or wider, so no view carries more than a few hundred markers.
 * A cell holding one job names it.
 */
async function boardClusters(
	installer: InstallerContext,
	query: BoardQuery,
	zoom: number
): Promise<BoardCluster[]> {
	const extent = query.bounds ?? circleBox(installer);
	const span = Math.max(extent.maxLat - extent.minLat, extent.maxLng - extent.minLng);
	// A 256 px tile spans 360 / 2^zoom degrees of longitude, so a quarter tile is 64 px.
	const cell = Math.max(360 / 2 ** (zoom + 2), span / MAX_CLUSTER_CELLS_ACROSS, 1e-6);
	const { rows } = await db.execute<{
		count: number;
		lat: number;
		lng: number;
		job_id: string | null;
		title: string | null;
	}>(sql`select count(*)::int as count, avg(j.cell_latitude) as lat, avg(j.cell_longitude) as lng,
			case when count(*) = 1 then min(j.id::text) end as job_id,
			case when count(*) = 1 then min(j.title) end as title
		from job j
		where ${boardWhere(installer, query)}
		group by floor(j.cell_latitude / ${cell}::float8), floor(j.cell_longitude / ${cell}::float8)`);
	return rows.map((r) => ({
		lat: r.lat,
		lng: r.lng,
		count: r.count,
		job: r.job_id ? { id: r.job_id, title: titleOrUntitled(r.title) } : null
	}));
}

/** The latitude/longitude box of the installer's circle, for sizing the clusters of a whole-circle view. */
function circleBox(installer: InstallerContext): BoundingBox {
	const dLat = (installer.serviceRadiusKm / distanceKm({ lat: 0, lng: 0 }, { lat: 1, lng: 0 })) * 1;
	const dLng = dLat / Math.max(0.01, Math.cos((installer.base.lat * Math.PI) / 180));
	return {
		minLat: installer.base.lat - dLat,
		maxLat: installer.base.lat + dLat,
		minLng: installer.base.lng - dLng,
		maxLng: installer.base.lng + dLng
	};
}

/** How many offered jobs match the query (no cursor): one count over the circle's index. */
async function boardTotal(installer: InstallerContext, query: BoardQuery): Promise<number> {
	const { rows } = await db.execute<{ n: number }>(
		sql`select count(*)::int as n from job j where ${boardWhere(installer, query)}`
	);
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
 * `days` days: one page of the "newest" sort with a date limit.
 */
export async function listNewOfferedJobs(
	installer: InstallerContext,
	options: { days?: number; limit?: number; now?: Date } = {}
) {
	const since = new Date((options.now ?? new Date()).getTime() - (options.days ?? 7) * 86_400_000);
	const query = boardQuerySchema.parse({
		sort: 'newest',
		unquoted: '1',
		limit: String(options.limit ?? 8)
	});
	const page = await boardPage(installer, query);
	return (page?.jobs ?? []).filter((j) => new Date(j.postedAt) >= since);
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
	return {
		id: j.id,
		status: j.status,
		title: titleOrUntitled(j.title),
		suburb: j.suburb,
		postcode: j.postcode,
		approx,
		locationMode: j.locationMode,
		preferredWindows: j.preferredWindows,
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
		const byInstaller = new Map<string, { email: string; displayName: string; jobs: DigestJob[] }>();
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

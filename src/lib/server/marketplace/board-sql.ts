/**
 * The job board's SQL, built here and run by $lib/server/marketplace/matching (and explained by `npm run
 * bench`, which is why this module has no database handle of its own): the offer of one installer
 * as SQL predicates over `job j` (ST_DWithin on the cell point's GiST index, on the one distance
 * model's sphere: `use_spheroid => false`; skills as `required_skills <@ skills`; working mode),
 * every filter of GET /api/jobs, keyset paging on (sort key, id) and the map's grid clusters.
 */
import { sql, type SQL } from 'drizzle-orm';
import { z } from 'zod';
import { distanceKm, type BoundingBox, type LatLng } from '$lib/geo';
import type { InstallerReach } from '$lib/marketplace/matching';
import {
	BOARD_DEFAULT_DIR,
	BOARD_SORTS,
	MAX_CLUSTER_CELLS_ACROSS,
	type BoardSort
} from '$lib/marketplace/board';
import { decodeCursor } from '$lib/paging';
import { BODY_STYLES, CAMERA_SETUPS, POWER_MODES } from '$lib/scope/request';
import { INSTALLER_SKILLS } from '$lib/people/vetting';

/** The service-area form's upper limit, so a circle this wide around a job holds every installer who could reach it. */
export const MAX_SERVICE_RADIUS_KM = 200;

/** Who the board is for: their reach and their id (for their own quotes). */
export type BoardInstaller = InstallerReach & { id: string };

/** A point as PostGIS geography (longitude first, as PostGIS orders it). */
const geography = (p: LatLng): SQL =>
	sql`st_setsrid(st_makepoint(${p.lng}::float8, ${p.lat}::float8), 4326)::geography`;

/**
 * `ST_DWithin(j.approx_location, point, metres, false)`, spelled out as the two halves PostGIS's
 * own index support turns it into: the GiST box test (`&&` on the point's box grown by the
 * distance) and the exact test on the sphere. Written whole, PostgreSQL estimates the exact test
 * to keep about one row in ten thousand, and then never reads the nearest-first or date indexes
 * for a page (bench/RESULTS.md showed the whole circle sorted for 25 rows); written so, the box
 * test is estimated from the column's statistics. The answer is the same.
 */
function withinMetres(point: SQL, metres: SQL): SQL {
	return sql`(j.approx_location && _st_expand(${point}, ${metres}) and _st_dwithin(j.approx_location, ${point}, ${metres}, false))`;
}

/** A PostgreSQL text[] literal, so a list travels as one parameter. */
function textArray(values: readonly string[]): string {
	return `{${values.map((v) => `"${v.replace(/["\\]/g, '\\$&')}"`).join(',')}}`;
}

/**
 * The SQL form of matchProblem for one installer, over `job` aliased `j`: open, cell centre inside
 * the circle (inclusive), skills covered, working mode offered (a job that names no mode takes
 * either). A job without a place or request has a null cell point or null skills and so never
 * matches, as jobReach gives null for it.
 */
function offeredTo(installer: InstallerReach): SQL {
	const parts = [
		sql`j.status = 'collecting_quotes'`,
		withinMetres(geography(installer.base), sql`${installer.serviceRadiusKm * 1000}::float8`)
	];
	// "Needs none of the skills the installer lacks" is "required_skills <@ skills" (every needed
	// skill is one of INSTALLER_SKILLS), and PostgreSQL estimates it far better, so the planner
	// keeps the nearest-first index scan; nothing lacking, nothing to test.
	const lacking = INSTALLER_SKILLS.filter((s) => !installer.skills.includes(s));
	parts.push(
		lacking.length > 0
			? sql`j.required_skills is not null and not (j.required_skills && ${textArray(lacking)}::text[])`
			: sql`j.required_skills is not null`
	);
	if (!installer.offersMobile || !installer.offersWorkshop) {
		const mode = installer.offersMobile ? 'mobile' : installer.offersWorkshop ? 'workshop' : null;
		parts.push(
			mode
				? sql`(j.location_mode is null or j.location_mode = ${mode})`
				: sql`j.location_mode is null`
		);
	}
	return sql.join(parts, sql` and `);
}

/**
 * The same rule from the installer's side, joining `installer_profile` aliased `p` to `job` `j`:
 * the first ST_DWithin (the largest radius allowed) can use the GiST index on either point, the
 * second is the installer's own circle.
 */
export const REACHES = sql`st_dwithin(p.base, j.approx_location, ${sql.raw(String(MAX_SERVICE_RADIUS_KM * 1000))}, false)
	and st_dwithin(p.base, j.approx_location, p.service_radius_km * 1000.0, false)
	and p.vetting_status = 'approved' and p.paused_reason is null
	and j.required_skills <@ p.skills
	and (j.location_mode is null
		or (j.location_mode = 'mobile' and p.offers_mobile)
		or (j.location_mode = 'workshop' and p.offers_workshop))`;

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

/** A board query as the server builds it: the API's parameters, and a posting-date limit. */
export type BoardSqlQuery = Omit<BoardQuery, 'sort' | 'limit'> & { postedSince?: Date };

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
	return sql`${exact} and ${withinMetres(geography(centre), sql`${reach * 1000 + 1}::float8`)}`;
}

/** Every condition of a board query but the cursor: the installer's offer and the filters. */
function boardWhere(installer: BoardInstaller, query: BoardSqlQuery): SQL {
	// "Within maxKm" narrows the circle itself: one distance test, not two (PostgreSQL would
	// count each as a separate cut and expect too few rows).
	const radiusKm =
		query.maxKm === undefined
			? installer.serviceRadiusKm
			: Math.min(installer.serviceRadiusKm, query.maxKm);
	const parts = [offeredTo({ ...installer, serviceRadiusKm: radiusKm })];
	if (query.bodyStyle) parts.push(sql`j.body_style = ${query.bodyStyle}`);
	if (query.cameras) parts.push(sql`j.cameras = ${query.cameras}`);
	if (query.power) parts.push(sql`j.power = ${query.power}`);
	if (query.unquoted) {
		parts.push(
			sql`not exists (select 1 from quote q where q.job_id = j.id and q.installer_id = ${installer.id})`
		);
	}
	if (query.bounds) parts.push(inBounds(query.bounds));
	if (query.postedSince) {
		parts.push(sql`j.submitted_at >= ${query.postedSince.toISOString()}::timestamptz`);
	}
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

/**
 * One page of offered jobs, filtered, sorted and paged in SQL: keyset on (sort key, id), the id
 * running the same way as the key, so the page is a range of an index (the KNN scan for
 * distance, a btree for the others) and costs the page, not the market. The inner query finds the
 * page; the outer one reads the installer's own quote and (for jobs posted before the summary
 * column) the scope for those rows only. One row more than the page says whether there is more.
 * @returns null when the cursor is not one this API made for this sort
 */
export function boardPageSql(
	installer: BoardInstaller,
	query: BoardQuery & { postedSince?: Date }
): SQL | null {
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
	const where = sql.join(conditions, sql` and `);
	// The KNN scan orders by distance alone, never by (distance, id), and jobs in one cell tie.
	// So nearest first is two steps: the KNN scan reads the page's n + 1 rows to find how far the
	// page reaches, then every row up to that distance (ties at the edge included) is sorted by
	// (distance, id). Fewer rows than a page: the whole circle is the bound.
	const edge =
		query.sort === 'distance' && dir === 'asc'
			? sql`with edge as (select coalesce((select j.approx_location <-> ${base} from job j where ${where}
					order by j.approx_location <-> ${base} offset ${query.limit} limit 1),
					${installer.serviceRadiusKm * 1000}::float8) as metres)`
			: sql``;
	const bounded =
		query.sort === 'distance' && dir === 'asc'
			? sql`${where} and ${withinMetres(base, sql`(select metres from edge)`)}`
			: where;
	return sql`${edge}
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
			where ${bounded}
			order by ${sort.key(base)} ${order}, j.id ${order}
			limit ${query.limit + 1}
		) page
		order by ${query.sort === 'distance' ? sql`page.distance_m` : sql`page.sort_value`} ${order}, page.id ${order}`;
}

/** The latitude/longitude box of the installer's circle, for sizing the clusters of a whole-circle view. */
function circleBox(installer: BoardInstaller): BoundingBox {
	const dLat = installer.serviceRadiusKm / distanceKm({ lat: 0, lng: 0 }, { lat: 1, lng: 0 });
	const dLng = dLat / Math.max(0.01, Math.cos((installer.base.lat * Math.PI) / 180));
	return {
		minLat: installer.base.lat - dLat,
		maxLat: installer.base.lat + dLat,
		minLng: installer.base.lng - dLng,
		maxLng: installer.base.lng + dLng
	};
}

/**
 * The map's markers for a view: offered jobs (after the filters) gathered into a grid of at most
 * MAX_CLUSTER_CELLS_ACROSS² cells over the view (or the service circle), each cell about 64
 * screen pixels at the zoom given or wider, so no view carries more than a few hundred markers.
 * A cell holding one job names it.
 */
export function boardClustersSql(installer: BoardInstaller, query: BoardQuery, zoom: number): SQL {
	const extent = query.bounds ?? circleBox(installer);
	const span = Math.max(extent.maxLat - extent.minLat, extent.maxLng - extent.minLng);
	// A 256 px tile spans 360 / 2^zoom degrees of longitude, so a quarter tile is 64 px.
	const cell = Math.max(360 / 2 ** (zoom + 2), span / MAX_CLUSTER_CELLS_ACROSS, 1e-6);
	return sql`select count(*)::int as count, avg(j.cell_latitude) as lat, avg(j.cell_longitude) as lng,
			case when count(*) = 1 then min(j.id::text) end as job_id,
			case when count(*) = 1 then min(j.title) end as title
		from job j
		where ${boardWhere(installer, query)}
		group by floor(j.cell_latitude / ${cell}::float8), floor(j.cell_longitude / ${cell}::float8)`;
}

/** How many offered jobs match the query (its cursor aside): one count over the circle's index. */
export function boardTotalSql(installer: BoardInstaller, query: BoardSqlQuery): SQL {
	return sql`select count(*)::int as n from job j where ${boardWhere(installer, query)}`;
}

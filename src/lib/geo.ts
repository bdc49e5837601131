/**
 * Distance and location privacy. Tapline has one distance model, used for every decision, filter,
 * figure shown, circle drawn and travel fee: great-circle distance on the sphere of the WGS84 mean
 * radius that PostGIS uses for geography with `use_spheroid => false` (ST_DWithin, ST_Distance,
 * the <-> operator), so the pure code here and the SQL of $lib/server/marketplace/matching agree to well
 * under a millimetre. The ellipsoid would change distances by a few tenths of a percent, which no
 * service radius needs, and a sphere keeps the browser, the server and PostgreSQL on one formula.
 */
import { distance } from '@turf/distance';

/** A point in decimal degrees (WGS84 latitude and longitude). */
export type LatLng = { lat: number; lng: number };

/** Latitude and longitude limits, inclusive, in decimal degrees. */
export type BoundingBox = { minLat: number; maxLat: number; minLng: number; maxLng: number };

/** A point snapped to the centre of its grid cell, with the cell's id. */
export type SnappedPoint = LatLng & { cellId: string };

/** WGS84 semi-major axis a, metres (NIMA TR8350.2, WGS84). */
const WGS84_A = 6378137;
/** WGS84 flattening f = 1 / 298.257223563 (NIMA TR8350.2, WGS84). */
const WGS84_F = 1 / 298.257223563;

/**
 * The mean Earth radius R1 = (2a + b) / 3 of the WGS84 ellipsoid (IUGG), in km: 6371.0087714.
 * PostGIS computes its sphere's radius this way (spheroid_init in liblwgeom); turf rounds the same
 * figure to 6371.0088 km, which would put the two 0.9 mm apart at 200 km.
 */
export const EARTH_RADIUS_KM = (2 * WGS84_A + WGS84_A * (1 - WGS84_F)) / 3 / 1000;

/** Leaflet's L.circle measures its radius on a sphere of 6,371,000 m (L.CRS.Earth.R). */
const LEAFLET_EARTH_RADIUS_M = 6371000;

/**
 * Kilometres per degree used for the privacy grid's rows: 111.32 km is one degree along the
 * WGS84 equator (6378.137 km x π / 180, worked by hand), the usual rounded km-per-degree figure.
 * The grid only needs to be roughly 1 km, and a fixed figure keeps cell ids stable if the
 * distance model ever changes.
 */
export const KM_PER_DEGREE_LATITUDE = 111.32;

const DEGREES = 180 / Math.PI;
const RADIANS = Math.PI / 180;
// Float rounding in the trigonometry below is around 1e-15 of a degree; widening by far more
// than that keeps the "every point inside" promise without noticeably growing the box.
const BOX_MARGIN_DEGREES = 1e-9;

/**
 * Great-circle distance between two points in kilometres: turf's haversine angle on the sphere
 * of {@link EARTH_RADIUS_KM}, the distance PostGIS gives geography with use_spheroid => false.
 * @param a first point
 * @param b second point
 */
export function distanceKm(a: LatLng, b: LatLng): number {
	assertLatLng(a);
	assertLatLng(b);
	return distance([a.lng, a.lat], [b.lng, b.lat], { units: 'radians' }) * EARTH_RADIUS_KM;
}

/**
 * A distance as shown to people: kilometres to one decimal, rounded up, so a job shown as
 * "39.0 km" is inside a 39 km circle or a "within 39 km" filter and one shown as "39.1 km" is not.
 * @param metres the model's distance in metres (from SQL or {@link distanceKm} × 1000)
 */
export function shownKm(metres: number): number {
	return Math.ceil(metres / 100) / 10;
}

/**
 * The radius to give Leaflet's L.circle so it draws the circle of {@link EARTH_RADIUS_KM}'s model
 * (same central angle): Leaflet measures on its own, slightly smaller sphere.
 * @param radiusKm the service radius in the model's kilometres
 */
export function leafletRadiusMetres(radiusKm: number): number {
	return ((radiusKm * 1000) / (EARTH_RADIUS_KM * 1000)) * LEAFLET_EARTH_RADIUS_M;
}

/**
 * A latitude/longitude box that contains every point within `radiusKm` of `center` (as measured
 * by {@link distanceKm}), for an indexed pre-filter before the exact distance check.
 *
 * With δ = radiusKm / R the angular radius and φ the centre latitude:
 * - latitude: φ ± δ, because the nearest and farthest points north and south lie on the
 *   centre's meridian;
 * - longitude: λ ± asin(sin δ / cos φ). This is the "widen by 1/cos φ" rule applied to sines:
 *   the points of the circle farthest east and west are where a meridian is tangent to it, and
 *   spherical trigonometry gives sin Δλ = sin δ / cos φ there. The plainer δ / cos φ is slightly
 *   too small (asin x > x), so it could miss points at the east and west edges.
 * When the circle reaches a pole (|φ| + δ ≥ 90°) every longitude is possible, so the box spans
 * all of them and its latitude is clamped to ±90°. When it crosses the ±180° meridian the box
 * also spans every longitude, which stays correct and keeps the SQL a plain BETWEEN.
 * @param center centre of the search
 * @param radiusKm search radius, ≥ 0
 */
export function boundingBox(center: LatLng, radiusKm: number): BoundingBox {
	assertLatLng(center);
	if (!Number.isFinite(radiusKm) || radiusKm < 0) {
		throw new RangeError(`radiusKm must be a finite number ≥ 0, got ${String(radiusKm)}`);
	}
	const angular = radiusKm / EARTH_RADIUS_KM;
	const angularDeg = angular * DEGREES + BOX_MARGIN_DEGREES;
	const minLat = center.lat - angularDeg;
	const maxLat = center.lat + angularDeg;
	if (minLat <= -90 || maxLat >= 90 || angular >= Math.PI / 2) {
		return {
			minLat: Math.max(minLat, -90),
			maxLat: Math.min(maxLat, 90),
			minLng: -180,
			maxLng: 180
		};
	}
	const lng = normaliseLongitude(center.lng);
	const halfWidthDeg =
		Math.asin(Math.min(1, Math.sin(angular) / Math.cos(center.lat * RADIANS))) * DEGREES +
		BOX_MARGIN_DEGREES;
	const minLng = lng - halfWidthDeg;
	const maxLng = lng + halfWidthDeg;
	if (minLng < -180 || maxLng > 180) return { minLat, maxLat, minLng: -180, maxLng: 180 };
	return { minLat, maxLat, minLng, maxLng };
}

/**
 * Snaps a point to the centre of its grid cell, so an installer browsing jobs sees where a job
 * roughly is without the owner's address. The grid is fixed, so every look at the same job
 * gives the identical point: there is no random jitter that repeated looks could average away.
 *
 * Cells: rows of `cellKm / 111.32` degrees of latitude counted from the South Pole; within a row
 * the longitude step is the latitude step widened by 1 / cos(row's centre latitude), then
 * rounded up so a whole number of cells fits around the parallel (no sliver cell at ±180°).
 * A cell is therefore about cellKm x cellKm, and the snapped point is within the cell's
 * half-diagonal (≈ 0.71 x cellKm) of the true point.
 * @param point the true location
 * @param cellKm cell size in km, > 0 (default 1)
 * @returns the cell centre and the cell id ('1km:r<row>:c<column>')
 */
export function snapToGrid(point: LatLng, cellKm = 1): SnappedPoint {
	assertLatLng(point);
	if (!Number.isFinite(cellKm) || cellKm <= 0) {
		throw new RangeError(`cellKm must be a finite number > 0, got ${String(cellKm)}`);
	}
	const latStep = cellKm / KM_PER_DEGREE_LATITUDE;
	const rowCount = Math.ceil(180 / latStep);
	// The North Pole itself would start a row of its own; keep it in the last row.
	const row = Math.min(Math.floor((point.lat + 90) / latStep), rowCount - 1);
	const rowCentreLat = Math.min(-90 + (row + 0.5) * latStep, 90);
	const widened = latStep / Math.cos(rowCentreLat * RADIANS);
	const columnCount = Math.max(1, Math.floor(360 / widened));
	const lngStep = 360 / columnCount;
	const column = Math.min(
		Math.floor((normaliseLongitude(point.lng) + 180) / lngStep),
		columnCount - 1
	);
	return {
		lat: rowCentreLat,
		lng: -180 + (column + 0.5) * lngStep,
		cellId: `${String(cellKm)}km:r${String(row)}:c${String(column)}`
	};
}

/**
 * Whether a job lies within an installer's service radius of their base (inclusive).
 * @param job the job's location
 * @param installerBase where the installer travels from
 * @param radiusKm the installer's service radius, ≥ 0
 */
export function withinServiceArea(job: LatLng, installerBase: LatLng, radiusKm: number): boolean {
	if (!Number.isFinite(radiusKm) || radiusKm < 0) {
		throw new RangeError(`radiusKm must be a finite number ≥ 0, got ${String(radiusKm)}`);
	}
	return distanceKm(job, installerBase) <= radiusKm;
}

/** Wraps a longitude into [-180, 180). */
function normaliseLongitude(lng: number): number {
	const wrapped = (((lng + 180) % 360) + 360) % 360;
	return wrapped - 180;
}

function assertLatLng(point: LatLng): void {
	if (!Number.isFinite(point.lat) || point.lat < -90 || point.lat > 90) {
		throw new RangeError(`Latitude must be between -90 and 90, got ${String(point.lat)}`);
	}
	if (!Number.isFinite(point.lng)) {
		throw new RangeError(`Longitude must be a finite number, got ${String(point.lng)}`);
	}
}

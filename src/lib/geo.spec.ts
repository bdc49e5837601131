import { Geodesic } from 'geographiclib-geodesic';
import { describe, expect, it } from 'vitest';
import {
	EARTH_RADIUS_KM,
	boundingBox,
	distanceKm,
	leafletRadiusMetres,
	shownKm,
	snapToGrid,
	withinServiceArea,
	type LatLng
} from './geo';

// Place coordinates are town and city centres to about 0.01°, from memory; the checks compare two
// algorithms on the same coordinates, so small errors in the places themselves do not matter.
const ADELAIDE: LatLng = { lat: -34.9285, lng: 138.6007 };
const GLENELG: LatLng = { lat: -34.98, lng: 138.513 };
const MOUNT_BARKER: LatLng = { lat: -35.0667, lng: 138.86 };
const GAWLER: LatLng = { lat: -34.6, lng: 138.75 };
const PORT_ADELAIDE: LatLng = { lat: -34.847, lng: 138.507 };
const VICTOR_HARBOR: LatLng = { lat: -35.5522, lng: 138.6186 };
const PERTH: LatLng = { lat: -31.9523, lng: 115.8613 };
const DARWIN: LatLng = { lat: -12.4634, lng: 130.8456 };
const HOBART: LatLng = { lat: -42.8821, lng: 147.3272 };

/** Seeded PRNG (mulberry32), so property tests are repeatable without extra packages. */
function mulberry32(seed: number): () => number {
	let state = seed >>> 0;
	return () => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = state;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

/** Point at a distance and bearing on the sphere (standard spherical "destination" formula). */
function destination(from: LatLng, km: number, bearingDeg: number): LatLng {
	const rad = Math.PI / 180;
	const d = km / EARTH_RADIUS_KM;
	const phi1 = from.lat * rad;
	const theta = bearingDeg * rad;
	const phi2 = Math.asin(
		Math.sin(phi1) * Math.cos(d) + Math.cos(phi1) * Math.sin(d) * Math.cos(theta)
	);
	const lambda2 =
		from.lng * rad +
		Math.atan2(
			Math.sin(theta) * Math.sin(d) * Math.cos(phi1),
			Math.cos(d) - Math.sin(phi1) * Math.sin(phi2)
		);
	return { lat: phi2 / rad, lng: ((((lambda2 / rad + 180) % 360) + 360) % 360) - 180 };
}

function ellipsoidKm(a: LatLng, b: LatLng): number {
	// Source: C. F. F. Karney, "Algorithms for geodesics", J. Geodesy 87 (2013) 43–55, as
	// implemented by geographiclib-geodesic; accurate to nanometres on the WGS84 ellipsoid.
	const { s12 } = Geodesic.WGS84.Inverse(a.lat, a.lng, b.lat, b.lng);
	if (s12 === undefined) throw new Error('geodesic inverse returned no distance');
	return s12 / 1000;
}

describe('distanceKm', () => {
	const pairs: Array<[string, LatLng, LatLng]> = [
		['Adelaide–Glenelg', ADELAIDE, GLENELG],
		['Adelaide–Mount Barker', ADELAIDE, MOUNT_BARKER],
		['Adelaide–Gawler', ADELAIDE, GAWLER],
		['Port Adelaide–Mount Barker', PORT_ADELAIDE, MOUNT_BARKER],
		['Adelaide–Victor Harbor', ADELAIDE, VICTOR_HARBOR],
		['Adelaide–Perth', ADELAIDE, PERTH],
		['Adelaide–Darwin', ADELAIDE, DARWIN],
		['Perth–Hobart', PERTH, HOBART]
	];

	it.each(pairs)('%s is within 0.5 %% of the WGS84 geodesic', (_name, a, b) => {
		const reference = ellipsoidKm(a, b);
		// Reference: Karney, J. Geodesy 87 (2013). Bound: a mean-radius sphere differs from the
		// WGS84 ellipsoid by up to about 0.5 % (from memory; the same order as the flattening,
		// 1/298.257), typically a few tenths of a percent.
		expect(Math.abs(distanceKm(a, b) - reference) / reference).toBeLessThanOrEqual(0.005);
	});

	it('is symmetric and zero for the same point', () => {
		expect(distanceKm(ADELAIDE, PERTH)).toBeCloseTo(distanceKm(PERTH, ADELAIDE), 9);
		expect(distanceKm(GLENELG, GLENELG)).toBe(0);
	});

	it('matches the published BNA–LAX haversine example', () => {
		// Rosetta Code, task "Haversine formula": Nashville International (N 36°7.2', W 86°40.2') to
		// Los Angeles International (N 33°56.4', W 118°24.0') with R = 6372.8 km gives
		// 2887.2599506071106 km (figures as published there, recalled from memory). Tapline uses
		// the WGS84 mean radius 6371.0087714 km, so rescale before comparing.
		const bna = { lat: 36 + 7.2 / 60, lng: -(86 + 40.2 / 60) };
		const lax = { lat: 33 + 56.4 / 60, lng: -(118 + 24 / 60) };
		expect((distanceKm(bna, lax) * 6372.8) / EARTH_RADIUS_KM).toBeCloseTo(2887.2599506, 5);
	});

	it('matches haversine examples worked by hand', () => {
		// Worked by hand: A = (0°, 0°), B = (60° N, 90° E).
		// hav(c) = hav(Δφ) + cos φ1 cos φ2 hav(Δλ) = sin²(30°) + 1 · 0.5 · sin²(45°)
		//        = 0.25 + 0.5 · 0.5 = 0.5, so c = 2 asin(√0.5) = 90° and d = (π/2) R
		//        = 1.5707963 x 6371.0088 km = 10 007.557 km.
		expect(distanceKm({ lat: 0, lng: 0 }, { lat: 60, lng: 90 })).toBeCloseTo(10_007.557, 2);
		// Worked by hand: A = (45° N, 0°), B = (45° N, 90° E).
		// hav(c) = 0 + cos²(45°) sin²(45°) = 0.5 · 0.5 = 0.25, so c = 2 asin(0.5) = 60° and
		// d = (π/3) R = 1.0471976 x 6371.0088 km = 6 671.705 km (shorter than the 7 076 km along
		// the 45th parallel, as a great circle should be).
		expect(distanceKm({ lat: 45, lng: 0 }, { lat: 45, lng: 90 })).toBeCloseTo(6_671.705, 2);
		// Worked by hand: one degree along the equator is R · π/180 = 111.195 km.
		expect(distanceKm({ lat: 0, lng: 138 }, { lat: 0, lng: 139 })).toBeCloseTo(111.195, 3);
	});

	it('rejects impossible latitudes', () => {
		expect(() => distanceKm({ lat: 91, lng: 0 }, ADELAIDE)).toThrow(RangeError);
		expect(() => distanceKm({ lat: Number.NaN, lng: 0 }, ADELAIDE)).toThrow(RangeError);
	});
});

describe('boundingBox', () => {
	it('widens longitude by more than latitude away from the equator', () => {
		const box = boundingBox(ADELAIDE, 50);
		const halfHeight = (box.maxLat - box.minLat) / 2;
		const halfWidth = (box.maxLng - box.minLng) / 2;
		// Worked by hand: 50 km / 6371.0088 km = 0.0078481 rad = 0.44966°.
		expect(halfHeight).toBeCloseTo(0.44966, 4);
		// Worked by hand: asin(sin 0.0078481 / cos 34.9285°) = asin(0.0078480 / 0.819874)
		// = 0.0095722 rad = 0.54845°, i.e. about 1/cos φ times the latitude half-height.
		expect(halfWidth).toBeCloseTo(0.54845, 4);
	});

	it('spans every longitude when the circle reaches a pole or crosses ±180°', () => {
		expect(boundingBox({ lat: -89.9, lng: 10 }, 50)).toEqual({
			minLat: -90,
			maxLat: expect.closeTo(-89.45, 2) as number,
			minLng: -180,
			maxLng: 180
		});
		const dateLine = boundingBox({ lat: -17, lng: 179.9 }, 50);
		expect([dateLine.minLng, dateLine.maxLng]).toEqual([-180, 180]);
	});

	it('contains every point within the radius (property test, seeded)', () => {
		const random = mulberry32(20_260_704);
		let checked = 0;
		for (let i = 0; i < 4000; i++) {
			const center = { lat: -80 + 160 * random(), lng: -179 + 358 * random() };
			const radiusKm = 0.5 + 200 * random();
			// Half the points sit right at the edge, where a too-small box would fail first.
			const km = radiusKm * (i % 2 === 0 ? random() : 0.999_999 + 0.000_001 * random());
			const point = destination(center, km, 360 * random());
			if (distanceKm(center, point) > radiusKm) continue;
			const box = boundingBox(center, radiusKm);
			checked++;
			expect(point.lat).toBeGreaterThanOrEqual(box.minLat);
			expect(point.lat).toBeLessThanOrEqual(box.maxLat);
			expect(point.lng).toBeGreaterThanOrEqual(box.minLng);
			expect(point.lng).toBeLessThanOrEqual(box.maxLng);
		}
		expect(checked).toBeGreaterThan(3900);
	});

	it('is tight: the due-east point at the radius is near the east edge', () => {
		// The farthest-east point of the circle is not due east (that lies on a great circle that
		// bends toward the equator) but the box must at least not be grossly loose.
		const box = boundingBox(ADELAIDE, 30);
		const east = destination(ADELAIDE, 30, 90);
		expect(box.maxLng - east.lng).toBeLessThan(0.001);
		expect(box.maxLng).toBeGreaterThanOrEqual(east.lng);
	});
});

describe('snapToGrid', () => {
	it('gives the identical point and cell for every look at the same place', () => {
		const first = snapToGrid(GLENELG);
		const second = snapToGrid({ ...GLENELG });
		expect(second).toEqual(first);
		expect(first.cellId).toMatch(/^1km:r\d+:c\d+$/);
		expect(first.lat).not.toBe(GLENELG.lat);
	});

	it('is idempotent, stays within the half-diagonal, and agrees within a cell (seeded)', () => {
		const random = mulberry32(5067);
		// Half-diagonal of a 1 km x 1 km cell: √2 / 2 = 0.7071 km (worked by hand). The cell is
		// a hair wider on its equator side (factor cos φ_edge / cos φ_centre, < 1.0002 below 60°)
		// and the grid's 111.32 km per degree is longer than the sphere's 111.195, so 0.71 km
		// is a safe upper bound for 1 km cells up to 60° of latitude.
		const halfDiagonalKm = 0.71;
		for (let i = 0; i < 3000; i++) {
			const point = { lat: -60 + 120 * random(), lng: -180 + 360 * random() };
			const snapped = snapToGrid(point);
			expect(snapToGrid(snapped)).toEqual(snapped);
			expect(distanceKm(point, snapped)).toBeLessThanOrEqual(halfDiagonalKm);
			// A point nudged toward the cell centre by a fraction of the way is in the same cell.
			const t = random();
			const nearby = {
				lat: point.lat + (snapped.lat - point.lat) * t,
				lng: point.lng + (snapped.lng - point.lng) * t
			};
			expect(snapToGrid(nearby)).toEqual(snapped);
		}
	});

	it('uses ~1 km rows and widens columns by 1/cos(latitude)', () => {
		// Worked by hand: the row step is 1 / 111.32 = 0.0089831°; at Adelaide's row (~34.93° S)
		// the column step is that / cos 34.93° = 0.010957°, i.e. about 1 km east–west.
		const a = snapToGrid(ADELAIDE);
		const north = snapToGrid({ lat: a.lat + 1 / 111.32, lng: a.lng });
		const east = snapToGrid({ lat: a.lat, lng: a.lng + 0.010957 });
		expect(north.lat - a.lat).toBeCloseTo(1 / 111.32, 9);
		expect(east.lng - a.lng).toBeCloseTo(0.010957, 5);
		expect(distanceKm(a, east)).toBeCloseTo(1, 1);
		// Rows do not line up column for column, so compare the north–south step on its own.
		expect(distanceKm({ lat: a.lat, lng: 0 }, { lat: north.lat, lng: 0 })).toBeCloseTo(1, 2);
	});

	it('handles the poles and the ±180° meridian', () => {
		expect(snapToGrid({ lat: 0, lng: 180 })).toEqual(snapToGrid({ lat: 0, lng: -180 }));
		const pole = snapToGrid({ lat: 90, lng: 45 });
		expect(pole.lat).toBeLessThanOrEqual(90);
		expect(snapToGrid(pole)).toEqual(pole);
		expect(() => snapToGrid(ADELAIDE, 0)).toThrow(RangeError);
	});
});

describe('withinServiceArea', () => {
	it('includes jobs inside the radius and excludes those outside', () => {
		// Adelaide–Gawler is about 39 km (see the geodesic comparison above).
		expect(withinServiceArea(GAWLER, ADELAIDE, 40)).toBe(true);
		expect(withinServiceArea(GAWLER, ADELAIDE, 38)).toBe(false);
		expect(withinServiceArea(ADELAIDE, ADELAIDE, 0)).toBe(true);
		expect(() => withinServiceArea(GAWLER, ADELAIDE, -1)).toThrow(RangeError);
	});
});

describe('the one distance model', () => {
	it('is the WGS84 mean radius R1 = (2a + b) / 3 that PostGIS uses for its sphere', () => {
		// NIMA TR8350.2 (WGS84): a = 6378137 m, 1/f = 298.257223563, so b = 6356752.314245 m and
		// R1 = (2 x 6378137 + 6356752.314245) / 3 = 6371008.771415 m (worked by hand). IUGG quotes
		// R1 = 6371.0088 km, the figure turf rounds to.
		expect(EARTH_RADIUS_KM).toBeCloseTo(6371.008771415, 9);
		expect(EARTH_RADIUS_KM.toFixed(4)).toBe('6371.0088');
	});

	it('agrees with geographiclib on the same sphere to well under a millimetre', () => {
		// Reference: Karney, J. Geodesy 87 (2013), geographiclib-geodesic with flattening 0.
		const sphere = new Geodesic.Geodesic(EARTH_RADIUS_KM * 1000, 0);
		const rand = mulberry32(2026);
		for (let i = 0; i < 500; i++) {
			const a = { lat: -40 + rand() * 15, lng: 130 + rand() * 15 };
			const b = { lat: a.lat + (rand() - 0.5) * 4, lng: a.lng + (rand() - 0.5) * 4 };
			const { s12 } = sphere.Inverse(a.lat, a.lng, b.lat, b.lng);
			expect(Math.abs(distanceKm(a, b) * 1000 - s12!)).toBeLessThan(1e-4);
		}
	});

	it('shows kilometres rounded up to 0.1, so the figure shown agrees with the circle', () => {
		// Worked by hand: 38,950 m is 38.95 km, shown 39.0; 39,000 m is exactly 39.0; one
		// centimetre more is outside a 39 km circle and shows 39.1.
		expect(shownKm(38_950)).toBe(39);
		expect(shownKm(39_000)).toBe(39);
		expect(shownKm(39_000.01)).toBe(39.1);
		expect(shownKm(0)).toBe(0);
	});

	it("draws Leaflet's circle with the same central angle on Leaflet's smaller sphere", () => {
		// Leaflet's L.CRS.Earth.R is 6,371,000 m (Leaflet source, from memory).
		const metres = leafletRadiusMetres(39);
		expect(metres / 6_371_000).toBeCloseTo(39 / EARTH_RADIUS_KM, 15);
		expect(metres).toBeLessThan(39_000);
		expect(39_000 - metres).toBeCloseTo(0.0537, 3);
	});
});

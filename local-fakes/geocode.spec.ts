import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ADELAIDE_SUBURBS } from './data/adelaide-suburbs';
import { distanceKm, nearestSuburb, searchSuburbs, type GeocodePlace } from './geocode';
import { startFakes, type RunningFakes } from './index';

const EPHEMERAL = {
	smtpPort: 0,
	mailHttpPort: 0,
	s3Port: 0,
	geocodePort: 0,
	tilesPort: 0,
	stripePort: 0
};

let fakes: RunningFakes;

async function getJson(path: string): Promise<{ status: number; body: unknown }> {
	const res = await fetch(`${fakes.urls.geocode}${path}`);
	return { status: res.status, body: await res.json() };
}

beforeAll(async () => {
	fakes = await startFakes(EPHEMERAL);
});

afterAll(async () => {
	await fakes.close();
});

describe('suburb data', () => {
	it('has about forty suburbs with four-digit SA postcodes inside the Adelaide region', () => {
		expect(ADELAIDE_SUBURBS.length).toBeGreaterThanOrEqual(40);
		for (const s of ADELAIDE_SUBURBS) {
			// South Australian postcodes run 5000–5799 (Australia Post; from memory).
			expect(s.postcode).toMatch(/^5[0-7]\d\d$/);
			// Every suburb within 60 km of the GPO (-34.9285, 138.6007), which bounds the metro area
			// and the near hills (from memory).
			expect(distanceKm(-34.9285, 138.6007, s.lat, s.lon)).toBeLessThan(60);
		}
		const names = ADELAIDE_SUBURBS.map((s) => s.name);
		expect(new Set(names).size).toBe(names.length);
	});

	it('measures one degree of latitude as about 111.2 km', () => {
		// 2πR/360 with R = 6371.0088 km (IUGG mean radius) is 111.195 km (from memory).
		expect(distanceKm(-35, 138.6, -34, 138.6)).toBeCloseTo(111.195, 2);
		// Adelaide GPO to Glenelg is roughly 10–11 km by road-map scale (from memory).
		expect(distanceKm(-34.9285, 138.6007, -34.9799, 138.5156)).toBeGreaterThan(9);
		expect(distanceKm(-34.9285, 138.6007, -34.9799, 138.5156)).toBeLessThan(11);
	});
});

describe('geocoder search', () => {
	it("finds Glenelg first for 'glen' and only suburbs starting with Glen", () => {
		const found = searchSuburbs('glen');
		expect(found[0]?.name).toBe('Glenelg');
		expect(found.every((s) => s.name.toLowerCase().startsWith('glen'))).toBe(true);
		expect(found.map((s) => s.name)).toContain('Glen Osmond');
	});

	it('answers Nominatim-shaped JSON over HTTP', async () => {
		const { status, body } = await getJson('/search?q=glen&format=json&countrycodes=au&limit=5');
		expect(status).toBe(200);
		const places = body as GeocodePlace[];
		expect(places.length).toBeLessThanOrEqual(5);
		const [first] = places;
		expect(first?.display_name).toMatch(/^Glenelg, /);
		expect(first?.type).toBe('suburb');
		// Glenelg, SA 5045 (Australia Post; from memory).
		expect(first?.address).toMatchObject({
			suburb: 'Glenelg',
			postcode: '5045',
			state: 'South Australia',
			country_code: 'au'
		});
		// Nominatim returns coordinates as strings.
		expect(typeof first?.lat).toBe('string');
		expect(Number(first?.lat)).toBeCloseTo(-34.98, 1);
		expect(Number(first?.lon)).toBeCloseTo(138.52, 1);
	});

	it("finds Norwood by postcode '5067'", async () => {
		// Norwood, SA 5067 (Australia Post; from memory).
		const { body } = await getJson('/search?q=5067&format=json&countrycodes=au');
		const places = body as GeocodePlace[];
		expect(places.map((p) => p.address.suburb)).toEqual(['Norwood']);
	});

	it('narrows a name by postcode and matches later words', () => {
		expect(searchSuburbs('Glenelg 5045').map((s) => s.name)).toEqual(['Glenelg', 'Glenelg North']);
		expect(searchSuburbs('glenelg, SA').map((s) => s.name)).toEqual(['Glenelg', 'Glenelg North']);
		expect(searchSuburbs('beach').map((s) => s.name)).toContain('Henley Beach');
		expect(searchSuburbs('zzz')).toEqual([]);
		expect(searchSuburbs('')).toEqual([]);
	});

	it('returns nothing outside the requested countries and limits results', async () => {
		const nz = await getJson('/search?q=glen&format=json&countrycodes=nz');
		expect(nz.body).toEqual([]);
		const one = await getJson('/search?q=glen&format=json&limit=1');
		expect(one.body).toHaveLength(1);
		const xml = await getJson('/search?q=glen&format=xml');
		expect(xml.status).toBe(400);
	});
});

describe('geocoder reverse', () => {
	it('returns the suburb nearest a point close to its centre', async () => {
		// About 300 m north-east of Norwood's centre.
		const { status, body } = await getJson('/reverse?lat=-34.919&lon=138.633&format=json');
		expect(status).toBe(200);
		expect((body as GeocodePlace).address.suburb).toBe('Norwood');
		expect(nearestSuburb(-34.9285, 138.6007)?.name).toBe('Adelaide');
		expect(nearestSuburb(-35.068, 138.855)?.name).toBe('Mount Barker');
	});

	it('answers "Unable to geocode" far from Adelaide and 400 for bad coordinates', async () => {
		// Perth, roughly -31.95, 115.86 (from memory): over 2000 km away.
		const far = await getJson('/reverse?lat=-31.95&lon=115.86&format=json');
		expect(far.body).toEqual({ error: 'Unable to geocode' });
		const bad = await getJson('/reverse?lat=abc&lon=138.6&format=json');
		expect(bad.status).toBe(400);
		const missing = await getJson('/reverse?lat=-34.9&format=json');
		expect(missing.status).toBe(400);
	});
});

describe('geocoder failures on demand', () => {
	it('answers 503 for the next N requests, then recovers', async () => {
		const armed = await fetch(`${fakes.urls.geocode}/control/fail-next`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify({ count: 2 })
		});
		expect(armed.status).toBe(200);
		expect((await getJson('/search?q=glen&format=json')).status).toBe(503);
		expect((await getJson('/reverse?lat=-34.92&lon=138.6&format=json')).status).toBe(503);
		const ok = await getJson('/search?q=glen&format=json');
		expect(ok.status).toBe(200);
		expect((ok.body as GeocodePlace[]).length).toBeGreaterThan(0);

		const bad = await fetch(`${fakes.urls.geocode}/control/fail-next`, {
			method: 'POST',
			body: JSON.stringify({ count: 'many' })
		});
		expect(bad.status).toBe(400);
	});
});

import type { IncomingMessage, ServerResponse } from 'node:http';
import { z } from 'zod';
import {
	ADELAIDE_SUBURBS,
	SUBURB_COUNTRY_CODE,
	SUBURB_STATE,
	type Suburb
} from './data/adelaide-suburbs';
import { listenHttp, readJson, sendJson, type RunningHttpServer } from './http-util';

/** Mean Earth radius in km (IUGG mean radius R1, 6371.0088 km, rounded). */
const EARTH_RADIUS_KM = 6371.0088;

/** Nominatim caps `limit` at 40 and defaults to 10 (Nominatim API docs, /search). */
const MAX_LIMIT = 40;
const DEFAULT_LIMIT = 10;

/** Reverse lookups further than this from every known suburb centre answer "Unable to geocode". */
const MAX_REVERSE_KM = 30;

// place_id values are only stable within this fake; offset so they never look like array indexes.
const PLACE_ID_BASE = 900_000;

/**
 * Great-circle distance between two WGS84 points in kilometres (haversine on a sphere).
 * Good to a few tenths of a percent, which is plenty for "nearest suburb".
 */
export function distanceKm(lat1: number, lon1: number, lat2: number, lon2: number): number {
	const rad = Math.PI / 180;
	const dLat = (lat2 - lat1) * rad;
	const dLon = (lon2 - lon1) * rad;
	const a =
		Math.sin(dLat / 2) ** 2 + Math.cos(lat1 * rad) * Math.cos(lat2 * rad) * Math.sin(dLon / 2) ** 2;
	return 2 * EARTH_RADIUS_KM * Math.asin(Math.min(1, Math.sqrt(a)));
}

function normalise(text: string): string {
	return text.toLowerCase().replace(/\s+/g, ' ').trim();
}

/**
 * Finds suburbs for a free-text query: a suburb name prefix (also matching the start of any
 * word, so "beach" finds "Henley Beach"), a postcode or postcode prefix, or both ("Norwood 5067",
 * "Glenelg, SA"). Whole-name prefixes rank above word prefixes, shorter names first.
 */
export function searchSuburbs(query: string, limit = DEFAULT_LIMIT): Suburb[] {
	const [firstPart = ''] = query.split(',');
	const postcode = /\b(\d{3,4})\b/.exec(query)?.[1];
	const name = normalise(firstPart.replace(/\d+/g, ' ').replace(/\b(sa|south australia)$/i, ''));
	if (name === '' && postcode === undefined) {
		return [];
	}
	const scored: { suburb: Suburb; score: number }[] = [];
	for (const suburb of ADELAIDE_SUBURBS) {
		if (postcode !== undefined && !suburb.postcode.startsWith(postcode)) {
			continue;
		}
		const full = normalise(suburb.name);
		let score: number;
		if (name === '') {
			score = suburb.postcode === postcode ? 0 : 1;
		} else if (full === name) {
			score = 0;
		} else if (full.startsWith(name)) {
			score = 1;
		} else if (full.split(' ').some((word) => word.startsWith(name))) {
			score = 2;
		} else {
			continue;
		}
		scored.push({ suburb, score });
	}
	scored.sort(
		(a, b) =>
			a.score - b.score ||
			a.suburb.name.length - b.suburb.name.length ||
			a.suburb.name.localeCompare(b.suburb.name)
	);
	return scored.slice(0, limit).map((s) => s.suburb);
}

/**
 * Returns the suburb whose centre is closest to the point, or null when none lies within
 * {@link MAX_REVERSE_KM} (the point is outside the demo market).
 */
export function nearestSuburb(lat: number, lon: number): Suburb | null {
	let best: Suburb | null = null;
	let bestKm = Infinity;
	for (const suburb of ADELAIDE_SUBURBS) {
		const km = distanceKm(lat, lon, suburb.lat, suburb.lon);
		if (km < bestKm) {
			best = suburb;
			bestKm = km;
		}
	}
	return bestKm <= MAX_REVERSE_KM ? best : null;
}

/** A result in the shape Nominatim's `format=json` gives, with `addressdetails` always on. */
export interface GeocodePlace {
	place_id: number;
	licence: string;
	lat: string;
	lon: string;
	class?: string;
	category?: string;
	type: 'suburb';
	addresstype: 'suburb';
	place_rank: number;
	importance: number;
	name: string;
	display_name: string;
	boundingbox: [string, string, string, string];
	address: {
		suburb: string;
		city: string;
		state: string;
		postcode: string;
		country: string;
		country_code: string;
	};
}

const LICENCE = 'Demo data, Tapline local fake';

function toPlace(suburb: Suburb, format: 'json' | 'jsonv2'): GeocodePlace {
	const index = ADELAIDE_SUBURBS.indexOf(suburb);
	// A suburb is a couple of kilometres across; 0.01° is about 1.1 km of latitude.
	const box: [string, string, string, string] = [
		(suburb.lat - 0.01).toFixed(7),
		(suburb.lat + 0.01).toFixed(7),
		(suburb.lon - 0.01).toFixed(7),
		(suburb.lon + 0.01).toFixed(7)
	];
	const place: GeocodePlace = {
		place_id: PLACE_ID_BASE + index,
		licence: LICENCE,
		lat: suburb.lat.toFixed(7),
		lon: suburb.lon.toFixed(7),
		type: 'suburb',
		addresstype: 'suburb',
		// Nominatim ranks suburbs at 20 (Nominatim docs, "Place Ranking").
		place_rank: 20,
		importance: 0.3,
		name: suburb.name,
		display_name: `${suburb.name}, Adelaide, ${SUBURB_STATE}, ${suburb.postcode}, Australia`,
		boundingbox: box,
		address: {
			suburb: suburb.name,
			city: 'Adelaide',
			state: SUBURB_STATE,
			postcode: suburb.postcode,
			country: 'Australia',
			country_code: SUBURB_COUNTRY_CODE
		}
	};
	// jsonv2 renames `class` to `category` (Nominatim API docs, output formats).
	if (format === 'jsonv2') {
		place.category = 'place';
	} else {
		place.class = 'place';
	}
	return place;
}

const failNextSchema = z.object({ count: z.number().int().min(0).max(10_000) });
const formatSchema = z.enum(['json', 'jsonv2']).default('json');

/** Options for {@link startGeocodeFake}. */
export interface GeocodeFakeOptions {
	host: string;
	port: number;
}

/** A running geocoder fake. */
export interface GeocodeFake {
	url: string;
	port: number;
	close(): Promise<void>;
}

/**
 * Starts the Nominatim-style geocoder: `GET /search`, `GET /reverse`, `GET /status`, and
 * `POST /control/fail-next {count}` to make the next N lookups answer 503.
 */
export async function startGeocodeFake(options: GeocodeFakeOptions): Promise<GeocodeFake> {
	let failNext = 0;

	async function handle(req: IncomingMessage, res: ServerResponse): Promise<void> {
		const url = new URL(req.url ?? '/', 'http://fake.invalid');
		// Nominatim allows any origin; the browser-side map may call it directly.
		res.setHeader('access-control-allow-origin', '*');

		if (url.pathname === '/control/fail-next') {
			if (req.method !== 'POST') {
				sendJson(res, 405, { error: 'use POST' });
				return;
			}
			const parsed = failNextSchema.safeParse(await readJson(req).catch(() => null));
			if (!parsed.success) {
				sendJson(res, 400, { error: 'expected JSON {"count": N}' });
				return;
			}
			failNext = parsed.data.count;
			sendJson(res, 200, { failNext });
			return;
		}
		if (req.method !== 'GET' && req.method !== 'HEAD') {
			sendJson(res, 405, { error: 'method not allowed' });
			return;
		}
		if (failNext > 0) {
			failNext--;
			sendJson(res, 503, { error: { code: 503, message: 'Service temporarily unavailable' } });
			return;
		}
		const format = formatSchema.safeParse(url.searchParams.get('format') ?? undefined);
		if (url.pathname === '/status') {
			sendJson(res, 200, { status: 0, message: 'OK' });
			return;
		}
		if (url.pathname === '/search') {
			if (!format.success) {
				sendJson(res, 400, { error: { code: 400, message: 'format must be json or jsonv2' } });
				return;
			}
			const q = url.searchParams.get('q') ?? '';
			const limitParam = Number(url.searchParams.get('limit') ?? DEFAULT_LIMIT);
			const limit = Number.isFinite(limitParam)
				? Math.min(MAX_LIMIT, Math.max(1, Math.trunc(limitParam)))
				: DEFAULT_LIMIT;
			const countryCodes = url.searchParams.get('countrycodes');
			const inCountry =
				countryCodes === null ||
				countryCodes
					.toLowerCase()
					.split(',')
					.map((c) => c.trim())
					.includes(SUBURB_COUNTRY_CODE);
			const found = inCountry ? searchSuburbs(q, limit) : [];
			sendJson(
				res,
				200,
				found.map((s) => toPlace(s, format.data))
			);
			return;
		}
		if (url.pathname === '/reverse') {
			if (!format.success) {
				sendJson(res, 400, { error: { code: 400, message: 'format must be json or jsonv2' } });
				return;
			}
			const lat = Number(url.searchParams.get('lat'));
			const lon = Number(url.searchParams.get('lon'));
			const latRaw = url.searchParams.get('lat');
			const lonRaw = url.searchParams.get('lon');
			if (
				latRaw === null ||
				lonRaw === null ||
				!Number.isFinite(lat) ||
				!Number.isFinite(lon) ||
				Math.abs(lat) > 90 ||
				Math.abs(lon) > 180
			) {
				sendJson(res, 400, { error: { code: 400, message: 'lat and lon must be valid degrees' } });
				return;
			}
			const suburb = nearestSuburb(lat, lon);
			// Nominatim answers 200 with an error object when nothing is near (API docs, /reverse).
			sendJson(res, 200, suburb ? toPlace(suburb, format.data) : { error: 'Unable to geocode' });
			return;
		}
		sendJson(res, 404, { error: { code: 404, message: 'not found' } });
	}

	const running: RunningHttpServer = await listenHttp(handle, options.host, options.port);
	return { url: running.url, port: running.port, close: running.close };
}

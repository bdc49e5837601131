/**
 * Place look-ups through a Nominatim-style geocoding API (GEOCODER_URL). Locally that is the
 * geocoder fake with Adelaide suburbs; production points the same calls at a hosted geocoder.
 */
import { env } from '$env/dynamic/private';
import { z } from 'zod';

const placeSchema = z.object({
	display_name: z.string(),
	lat: z.coerce.number(),
	lon: z.coerce.number(),
	address: z
		.object({ suburb: z.string().optional(), postcode: z.string().optional() })
		.partial()
		.optional()
});

export interface Place {
	label: string;
	suburb: string;
	postcode: string;
	lat: number;
	lng: number;
}

const base = () => env.GEOCODER_URL ?? 'http://127.0.0.1:2590';

function toPlace(raw: z.infer<typeof placeSchema>): Place {
	return {
		label: raw.display_name,
		suburb: raw.address?.suburb ?? raw.display_name.split(',')[0] ?? raw.display_name,
		postcode: raw.address?.postcode ?? '',
		lat: raw.lat,
		lng: raw.lon
	};
}

export class GeocoderUnavailable extends Error {}

async function getJson(url: URL): Promise<unknown> {
	let res: Response;
	try {
		res = await fetch(url, {
			signal: AbortSignal.timeout(5000),
			headers: { accept: 'application/json' }
		});
	} catch {
		throw new GeocoderUnavailable('The place finder did not answer');
	}
	if (!res.ok) throw new GeocoderUnavailable(`The place finder answered ${res.status}`);
	return res.json();
}

/** Suburbs or postcodes in Australia matching the text, best first. */
export async function searchPlaces(query: string, limit = 5): Promise<Place[]> {
	const url = new URL('/search', base());
	url.search = new URLSearchParams({
		q: query,
		format: 'json',
		addressdetails: '1',
		countrycodes: 'au',
		limit: String(limit)
	}).toString();
	const parsed = z.array(placeSchema).safeParse(await getJson(url));
	return parsed.success ? parsed.data.map(toPlace) : [];
}

/** The suburb at a point, or null when none is near. */
export async function reversePlace(lat: number, lng: number): Promise<Place | null> {
	const url = new URL('/reverse', base());
	url.search = new URLSearchParams({
		lat: String(lat),
		lon: String(lng),
		format: 'json',
		addressdetails: '1'
	}).toString();
	const parsed = placeSchema.safeParse(await getJson(url));
	return parsed.success ? toPlace(parsed.data) : null;
}

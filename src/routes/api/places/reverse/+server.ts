import { error, json } from '@sveltejs/kit';
import { z } from 'zod';
import { GeocoderUnavailable, reversePlace } from '$lib/server/marketplace/geocoding';
import { requireRole } from '$lib/server/http/guards';
import type { RequestHandler } from './$types';

const point = z.object({
	lat: z.coerce.number().min(-90).max(90),
	lng: z.coerce.number().min(-180).max(180)
});

/**
 * The suburb at a point on the map pickers, so the suburb field follows the pin
 * (`{ place: null }` when none is near). Signed-in people only, like the forward look-up.
 */
export const GET: RequestHandler = async ({ url }) => {
	requireRole();
	const parsed = point.safeParse({
		lat: url.searchParams.get('lat') ?? '',
		lng: url.searchParams.get('lng') ?? ''
	});
	// A missing or empty lat or lng is not 0 (found by the authorisation matrix: no query was
	// read as the point 0, 0).
	if (!parsed.success || !url.searchParams.get('lat') || !url.searchParams.get('lng'))
		error(400, 'Give the point as lat and lng in degrees.');
	try {
		return json({ place: await reversePlace(parsed.data.lat, parsed.data.lng) });
	} catch (err) {
		if (err instanceof GeocoderUnavailable)
			error(503, 'The place finder is not answering; try again shortly.');
		throw err;
	}
};

import { error, json } from '@sveltejs/kit';
import { textField } from '$lib/forms/fields';
import { GeocoderUnavailable, searchPlaces } from '$lib/server/marketplace/geocoding';
import { requireRole } from '$lib/server/http/guards';
import type { RequestHandler } from './$types';

const query = textField().trim().min(2).max(60);

/** Suburb or postcode look-up for the map pickers (signed-in people only, so it is not an open proxy). */
export const GET: RequestHandler = async ({ url }) => {
	requireRole();
	const q = query.safeParse(url.searchParams.get('q') ?? '');
	if (!q.success) error(400, 'Type at least two letters of a suburb, or a postcode.');
	try {
		return json({ places: await searchPlaces(q.data) });
	} catch (err) {
		if (err instanceof GeocoderUnavailable)
			error(503, 'The place finder is not answering; try again shortly.');
		throw err;
	}
};

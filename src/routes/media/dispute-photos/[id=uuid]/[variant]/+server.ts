import { error } from '@sveltejs/kit';
import { findViewableDisputePhoto } from '$lib/server/work/disputes';
import { requireRole } from '$lib/server/http/guards';
import { missingImageResponse, objectResponse } from '$lib/server/files/storage';
import type { RequestHandler } from './$types';

/** Streams a dispute photo to the booking's owner and installer and to admins; anyone else 404. */
export const GET: RequestHandler = async ({ params }) => {
	const viewer = requireRole();
	if (params.variant !== 'full' && params.variant !== 'thumb') error(404, 'No such photo');
	const photo = await findViewableDisputePhoto(params.id, viewer);
	if (!photo) error(404, 'No such photo');
	const response = await objectResponse(
		params.variant === 'thumb' ? photo.thumbKey : photo.objectKey
	);
	if (!response) return missingImageResponse();
	// Evidence in a dispute is as private as a receipt: never kept by the browser or a proxy.
	response.headers.set('cache-control', 'private, no-store');
	return response;
};

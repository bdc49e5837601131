import { error } from '@sveltejs/kit';
import { findViewableFitReportPhoto } from '$lib/server/work/fit-reports';
import { missingImageResponse, objectResponse } from '$lib/server/files/storage';
import { requireRole } from '$lib/server/http/guards';
import type { RequestHandler } from './$types';

/** Streams a fit-report photo to the booking's owner and installer and to admins; others get a 404. */
export const GET: RequestHandler = async ({ params }) => {
	const viewer = requireRole();
	if (params.variant !== 'full' && params.variant !== 'thumb') error(404, 'No such photo');
	const photo = await findViewableFitReportPhoto(params.id, viewer);
	if (!photo) error(404, 'No such photo');
	const response = await objectResponse(
		params.variant === 'thumb' ? photo.thumbKey : photo.objectKey
	);
	return response ?? missingImageResponse();
};

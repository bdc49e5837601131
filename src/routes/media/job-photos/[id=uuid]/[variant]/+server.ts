import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/http/guards';
import { isQuotingInstaller } from '$lib/server/people/installers';
import { findViewableJobPhoto } from '$lib/server/marketplace/jobs';
import { missingImageResponse, objectResponse } from '$lib/server/files/storage';
import type { RequestHandler } from './$types';

/** Streams a job photo to those allowed to see it; everyone else gets a 404 (not even existence leaks). */
export const GET: RequestHandler = async ({ params }) => {
	const viewer = requireRole();
	if (params.variant !== 'full' && params.variant !== 'thumb') error(404, 'No such photo');
	const photo = await findViewableJobPhoto(params.id, viewer, isQuotingInstaller);
	if (!photo) error(404, 'No such photo');
	const response = await objectResponse(
		params.variant === 'thumb' ? photo.thumbKey : photo.objectKey
	);
	return response ?? missingImageResponse();
};

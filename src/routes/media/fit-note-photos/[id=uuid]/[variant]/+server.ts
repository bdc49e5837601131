import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/http/guards';
import { findViewableFitNotePhoto } from '$lib/server/fit-notes/fit-notes';
import { missingImageResponse, objectResponse } from '$lib/server/files/storage';
import type { RequestHandler } from './$types';

/** Streams a fit note photo to vetted installers in good standing; everyone else gets a 404. */
export const GET: RequestHandler = async ({ params }) => {
	const viewer = requireRole();
	if (params.variant !== 'full' && params.variant !== 'thumb') error(404, 'No such photo');
	const photo =
		viewer.role === 'installer' ? await findViewableFitNotePhoto(params.id, viewer.id) : null;
	if (!photo) error(404, 'No such photo');
	const response = await objectResponse(
		params.variant === 'thumb' ? photo.thumbKey : photo.objectKey
	);
	return response ?? missingImageResponse();
};

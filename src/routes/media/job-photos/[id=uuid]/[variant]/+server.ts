import { error } from '@sveltejs/kit';
import { and, eq, isNull } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { installerProfile } from '$lib/server/db/schema';
import { requireRole } from '$lib/server/guards';
import { findViewableJobPhoto } from '$lib/server/jobs';
import { missingImageResponse, objectResponse } from '$lib/server/storage';
import type { RequestHandler } from './$types';

const isVettedInstaller = async (id: string) => {
	const [row] = await db
		.select({ id: installerProfile.userId })
		.from(installerProfile)
		.where(
			and(
				eq(installerProfile.userId, id),
				eq(installerProfile.vettingStatus, 'approved'),
				isNull(installerProfile.pausedReason)
			)
		);
	return Boolean(row);
};

/** Streams a job photo to those allowed to see it; everyone else gets a 404 (not even existence leaks). */
export const GET: RequestHandler = async ({ params }) => {
	const viewer = requireRole();
	if (params.variant !== 'full' && params.variant !== 'thumb') error(404, 'No such photo');
	const photo = await findViewableJobPhoto(params.id, viewer, isVettedInstaller);
	if (!photo) error(404, 'No such photo');
	const response = await objectResponse(
		params.variant === 'thumb' ? photo.thumbKey : photo.objectKey
	);
	return response ?? missingImageResponse();
};

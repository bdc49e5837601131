import { error } from '@sveltejs/kit';
import { missingImageResponse, objectResponse } from '$lib/server/files/storage';
import { findViewableDocument } from '$lib/server/people/documents';
import { isProfilePublic } from '$lib/people/vetting';
import type { RequestHandler } from './$types';

/**
 * Streams an installer's document after the access check: the installer and admins only, except
 * gallery photos while the profile is public. `?thumb` serves a photo's thumbnail. Every document
 * but a public gallery photo is sent as an attachment (a download, never rendered in the page's
 * origin), with nosniff and a sandboxing policy from objectResponse.
 */
export const GET: RequestHandler = async ({ locals, params, url }) => {
	const viewer = locals.user ? { id: locals.user.id, role: locals.user.role } : null;
	const doc = await findViewableDocument(viewer, params.id);
	if (doc === 'sign-in') error(401, 'Sign in to see this document.');
	if (doc === 'forbidden')
		error(403, 'This document is private to the installer and Tapline admins.');
	if (doc === 'not-found') error(404, 'There is no such document.');
	const shownPublicly = doc.kind === 'gallery' && isProfilePublic(doc.vettingStatus);
	const key = url.searchParams.has('thumb') && doc.thumbKey ? doc.thumbKey : doc.objectKey;
	const response = await objectResponse(key, {
		downloadName: shownPublicly ? undefined : doc.originalName
	});
	if (!response && doc.contentType.startsWith('image/')) return missingImageResponse();
	if (!response) error(404, 'The file is missing from storage.');
	if (!shownPublicly) response.headers.set('cache-control', 'private, no-store');
	return response;
};

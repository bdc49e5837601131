import { error } from '@sveltejs/kit';
import { missingImageResponse, objectResponse } from '$lib/server/storage';
import { findViewableDocument } from '$lib/server/documents';
import type { RequestHandler } from './$types';

/**
 * Streams an installer's document after the access check: the installer and admins only, except
 * gallery photos, which are public. `?thumb` serves a photo's thumbnail. PDFs are sent as
 * downloads: the storage response is sandboxed, and browsers will not render a PDF in a sandbox.
 */
export const GET: RequestHandler = async ({ locals, params, url }) => {
	const viewer = locals.user ? { id: locals.user.id, role: locals.user.role } : null;
	const doc = await findViewableDocument(viewer, params.id);
	if (doc === 'sign-in') error(401, 'Sign in to see this document.');
	if (doc === 'forbidden')
		error(403, 'This document is private to the installer and Tapline admins.');
	if (doc === 'not-found') error(404, 'There is no such document.');
	const key = url.searchParams.has('thumb') && doc.thumbKey ? doc.thumbKey : doc.objectKey;
	const response = await objectResponse(key, {
		downloadName: doc.contentType === 'application/pdf' ? doc.originalName : undefined
	});
	if (!response && doc.contentType.startsWith('image/')) return missingImageResponse();
	if (!response) error(404, 'The file is missing from storage.');
	if (doc.kind !== 'gallery') response.headers.set('cache-control', 'private, no-store');
	return response;
};

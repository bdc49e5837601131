/**
 * For the few actions that read the posted form themselves (uploads, one-field buttons) instead of
 * through superforms, which already treats an unreadable body as an empty, invalid form.
 */

/** Shown when the body cannot be read as a form. */
export const UNREADABLE_FORM_MESSAGE =
	'We could not read what was sent. Reload the page and try again.';

/**
 * The posted form, or null when the body is not a readable form (a cut-off or malformed
 * multipart body, a content type that is not a form): the caller answers 400, never a 500.
 */
export async function readFormData(request: Request): Promise<FormData | null> {
	try {
		return await request.formData();
	} catch {
		return null;
	}
}

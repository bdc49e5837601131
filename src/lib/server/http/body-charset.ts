/**
 * Form bodies Tapline can read. Every form it serves posts UTF-8 (the HTML default for a page
 * served as UTF-8). A form body declared in another character set (`charset=utf-16`) is read by
 * the platform as an empty or garbled form; a form whose fields all have defaults would then pass
 * validation with none of what was sent, and write that (found by the fuzz suite: working hours
 * wiped by such a post). The hooks refuse these bodies before any action runs.
 */

/** Shown, with a 415, for a form body in a character set other than UTF-8. */
export const UNREADABLE_CHARSET_MESSAGE =
	'This form was sent in a character set Tapline cannot read. Reload the page and send it again.';

const FORM_TYPES = ['application/x-www-form-urlencoded', 'multipart/form-data', 'text/plain'];

/**
 * Whether a request body with this content-type header is a form declared in a character set
 * other than UTF-8 (or US-ASCII, a subset of it). No header, another type, or no charset: false.
 */
export function hasUnreadableCharset(contentType: string | null): boolean {
	if (!contentType) return false;
	const [type, ...params] = contentType.split(';').map((p) => p.trim().toLowerCase());
	if (type === undefined || !FORM_TYPES.includes(type)) return false;
	for (const param of params) {
		const eq = param.indexOf('=');
		if (eq < 0 || param.slice(0, eq).trim() !== 'charset') continue;
		const charset = param
			.slice(eq + 1)
			.trim()
			.replace(/^"(.*)"$/, '$1');
		return !['utf-8', 'utf8', 'us-ascii'].includes(charset);
	}
	return false;
}

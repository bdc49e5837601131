import { env } from '$env/dynamic/private';

/**
 * An absolute link into Tapline, for e-mails: the same from a request and from a background job,
 * because it comes from the configured `ORIGIN` and never from the request.
 * @param path a path starting with '/', with its query string if any
 */
export function appUrl(path: string): string {
	const origin = (env.ORIGIN ?? 'http://127.0.0.1:3000').replace(/\/+$/, '');
	return `${origin}${path.startsWith('/') ? path : `/${path}`}`;
}

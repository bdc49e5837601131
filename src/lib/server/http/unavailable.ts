/**
 * Whether an error means "the database (or another service the app talks to) is not reachable
 * just now": a restart, a failover, a network fault, as opposed to a fault in the request or the
 * code. Such requests are answered with 503 and a retry message (hooks.server.ts), not a 500.
 */
import errorTemplate from '../../../error.html?raw';

/** SQLSTATEs of a server going away or not taking connections (PostgreSQL manual, Appendix A). */
const UNAVAILABLE_SQLSTATES = new Set([
	'57P01', // admin_shutdown
	'57P02', // crash_shutdown
	'57P03', // cannot_connect_now (starting up or shutting down)
	'53300' // too_many_connections
]);

/** Node socket errors of a peer that is down or unreachable. */
const SOCKET_CODES = new Set([
	'ECONNREFUSED',
	'ECONNRESET',
	'EPIPE',
	'ETIMEDOUT',
	'EHOSTUNREACH',
	'ENETUNREACH',
	'EAI_AGAIN'
]);

/** node-postgres reports a dropped or timed-out connection with these messages and no code. */
const PG_CONNECTION_MESSAGES = [
	'Connection terminated',
	'timeout exceeded when trying to connect',
	'Client has encountered a connection error and is not queryable',
	'Client was closed and is not queryable'
];

/** True when the error, or one it wraps (Drizzle's `cause`, AggregateError), is a lost connection. */
export function isServiceUnavailable(err: unknown, depth = 0): boolean {
	if (!err || typeof err !== 'object' || depth > 5) return false;
	const e = err as { code?: unknown; message?: unknown; cause?: unknown; errors?: unknown };
	if (typeof e.code === 'string') {
		if (UNAVAILABLE_SQLSTATES.has(e.code) || e.code.startsWith('08')) return true;
		if (SOCKET_CODES.has(e.code)) return true;
	}
	const message = typeof e.message === 'string' ? e.message : '';
	if (PG_CONNECTION_MESSAGES.some((m) => message.startsWith(m))) return true;
	if (Array.isArray(e.errors) && e.errors.some((inner) => isServiceUnavailable(inner, depth + 1)))
		return true;
	return isServiceUnavailable(e.cause, depth + 1);
}

/** What a person sees meanwhile (the database is the usual cause; storage outages get it too). */
export const SERVICE_UNAVAILABLE_MESSAGE =
	'Tapline cannot reach its database just now. Please try again in a minute.';

/** Seconds a client is asked to wait before retrying (Retry-After). */
export const RETRY_AFTER_SECONDS = 30;

/**
 * The 503 for a request that failed inside a hook (the session read), returned rather than thrown:
 * SvelteKit answers an error thrown from `handle` itself, past the outer hook that adds Retry-After
 * and the security headers. Pages get the same fallback page as any other error (src/error.html);
 * API calls, data requests and enhanced forms get `{ message }` as JSON.
 */
export function unavailableResponse(request: Request, url: URL): Response {
	const wantsJson =
		url.pathname.startsWith('/api/') ||
		url.pathname.endsWith('/__data.json') ||
		(request.headers.get('accept') ?? '').includes('application/json');
	const headers = { 'retry-after': String(RETRY_AFTER_SECONDS), 'cache-control': 'no-store' };
	if (wantsJson) {
		return Response.json(
			{ message: SERVICE_UNAVAILABLE_MESSAGE, retry: true },
			{ status: 503, headers }
		);
	}
	const page = errorTemplate
		.replaceAll('%sveltekit.status%', '503')
		.replaceAll('%sveltekit.error.message%', SERVICE_UNAVAILABLE_MESSAGE);
	return new Response(page, {
		status: 503,
		headers: { ...headers, 'content-type': 'text/html; charset=utf-8' }
	});
}

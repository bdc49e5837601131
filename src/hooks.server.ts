import {
	error,
	redirect,
	type Handle,
	type HandleServerError,
	type ServerInit
} from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { building } from '$app/environment';
import { env } from '$env/dynamic/private';
import { env as publicEnv } from '$env/dynamic/public';
import { readSession } from '$lib/server/auth';
import { areaFor, signInUrl } from '$lib/server/http/guards';
import { pool } from '$lib/server/db';
import { startQueue, stopQueue } from '$lib/server/queue';
import { applySecurityHeaders } from '$lib/server/http/security-headers';
import {
	isServiceUnavailable,
	RETRY_AFTER_SECONDS,
	SERVICE_UNAVAILABLE_MESSAGE,
	unavailableResponse
} from '$lib/server/http/unavailable';
import { tileSource } from '$lib/map-tiles';
import { decodedPath, UNREADABLE_ADDRESS_MESSAGE } from '$lib/server/http/address';
import { hasUnreadableCharset, UNREADABLE_CHARSET_MESSAGE } from '$lib/server/http/body-charset';

export const init: ServerInit = async () => {
	if (building || env.TAPLINE_WORKER === 'off') return;
	await startQueue();
	// adapter-node emits this on SIGTERM/SIGINT once it stops taking requests: let running jobs
	// finish and close the pool, so the process exits by itself.
	process.once('sveltekit:shutdown', () => {
		void stopQueue().finally(() => pool.end());
	});
};

// Outermost: security headers on every answer the hooks below let through, and the 503 for a
// request that failed because the database was away (flagged by handleError).
const handleResponse: Handle = async ({ event, resolve }) => {
	event.locals.serviceUnavailable = false;
	let response = await resolve(event);
	if (event.locals.serviceUnavailable && response.status === 500) {
		response = new Response(response.body, { status: 503, headers: response.headers });
		response.headers.set('retry-after', String(RETRY_AFTER_SECONDS));
	}
	// A 503 raised anywhere else (the session read in handleSession, an endpoint) asks for the same wait.
	if (response.status === 503 && !response.headers.has('retry-after')) {
		response.headers.set('retry-after', String(RETRY_AFTER_SECONDS));
	}
	const tiles = tileSource(publicEnv.PUBLIC_TILE_URL);
	applySecurityHeaders(response.headers, {
		https: (env.ORIGIN ?? '').startsWith('https://'),
		private: event.locals.user !== null || event.url.pathname.startsWith('/api/'),
		imageSources: tiles ? [tiles] : [],
		formActions: (
			env.STRIPE_HOSTED_ORIGINS ?? 'https://checkout.stripe.com https://connect.stripe.com'
		)
			.split(/\s+/)
			.filter(Boolean)
	});
	return response;
};

// A NUL (%00) in the path or query reaches no route: route params and searches would carry it to
// PostgreSQL, which refuses it with a 500. A path that cannot be decoded (`/owner/%FF`) is answered
// here with a Response, not thrown: SvelteKit does not catch what a hook throws for such a path,
// and the rejection would stop the process (see address.ts).
const handleBadAddress: Handle = async ({ event, resolve }) => {
	if (decodedPath(event.url.pathname) === null) {
		return new Response(UNREADABLE_ADDRESS_MESSAGE, {
			status: 400,
			headers: { 'content-type': 'text/plain; charset=utf-8' }
		});
	}
	if (/%00/.test(event.url.pathname + event.url.search)) {
		error(400, 'This address contains a character Tapline cannot read (%00).');
	}
	// `?/default` names the default action, which SvelteKit reserves: it would throw (a 500).
	if (event.request.method === 'POST' && event.url.searchParams.has('/default')) {
		error(400, 'There is no form action by that name. Reload the page and try again.');
	}
	// A form body in another character set is read as an empty form (see body-charset.ts).
	if (hasUnreadableCharset(event.request.headers.get('content-type'))) {
		error(415, UNREADABLE_CHARSET_MESSAGE);
	}
	return resolve(event);
};

const handleSession: Handle = async ({ event, resolve }) => {
	event.locals.user = null;
	event.locals.session = null;
	let found;
	try {
		found = await readSession(event.cookies);
	} catch (err) {
		if (isServiceUnavailable(err)) return unavailableResponse(event.request, event.url);
		throw err;
	}
	event.locals.user = found.user;
	event.locals.session = found.session;
	return resolve(event);
};

// Role areas are guarded here, for every request (pages, data and form actions alike), not in
// layouts, which do not run for actions. areaFor reads the decoded, normalised path, so
// `/%6fwner/...` is the owner area too.
const handleRoleAreas: Handle = async ({ event, resolve }) => {
	const area = areaFor(event.url.pathname);
	if (area) {
		if (!event.locals.user) redirect(303, signInUrl(event.url));
		if (event.locals.user.role !== area.role) {
			error(403, 'This part of Tapline is for another kind of account.');
		}
	}
	return resolve(event);
};

export const handle = sequence(handleResponse, handleBadAddress, handleSession, handleRoleAreas);

// A load or action that failed because PostgreSQL was away (restart, failover) is not a bug: the
// person is asked to retry and handleResponse turns the 500 into a 503. Anything else is logged.
export const handleError: HandleServerError = ({ error: err, event, status, message }) => {
	if (isServiceUnavailable(err)) {
		event.locals.serviceUnavailable = true;
		console.error('[db] request failed while the database was away:', event.url.pathname);
		return { message: SERVICE_UNAVAILABLE_MESSAGE, retry: true };
	}
	if (status >= 500) console.error(err);
	return { message };
};

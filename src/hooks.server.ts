import { error, redirect, type Handle, type ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { building } from '$app/environment';
import { env } from '$env/dynamic/private';
import { readSession } from '$lib/server/auth';
import { areaFor, signInUrl } from '$lib/server/guards';
import { pool } from '$lib/server/db';
import { startQueue, stopQueue } from '$lib/server/queue';

export const init: ServerInit = async () => {
	if (building || env.TAPLINE_WORKER === 'off') return;
	await startQueue();
	// adapter-node emits this on SIGTERM/SIGINT once it stops taking requests: let running jobs
	// finish and close the pool, so the process exits by itself.
	process.once('sveltekit:shutdown', () => {
		void stopQueue().finally(() => pool.end());
	});
};

const handleSession: Handle = async ({ event, resolve }) => {
	const { user, session } = await readSession(event.cookies);
	event.locals.user = user;
	event.locals.session = session;
	return resolve(event);
};

// Role areas are guarded here, for every request (pages, data and form actions alike), not in
// layouts, which do not run for actions.
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

const handleSecurityHeaders: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	response.headers.set('X-Content-Type-Options', 'nosniff');
	response.headers.set('Referrer-Policy', 'strict-origin-when-cross-origin');
	response.headers.set('X-Frame-Options', 'DENY');
	return response;
};

export const handle = sequence(handleSession, handleRoleAreas, handleSecurityHeaders);

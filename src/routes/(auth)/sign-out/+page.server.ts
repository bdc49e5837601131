import { redirect } from '@sveltejs/kit';
import { endSession } from '$lib/server/auth';
import type { Actions, PageServerLoad } from './$types';

// Signing out is a POST (a link could be followed by a prefetcher); a GET just goes home.
export const load: PageServerLoad = () => redirect(303, '/');

export const actions = {
	default: async ({ locals, cookies }) => {
		if (locals.session) await endSession(cookies, locals.session.id);
		redirect(303, '/');
	}
} satisfies Actions;

import { error } from '@sveltejs/kit';
import { getPublicProfile } from '$lib/server/installers';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, locals }) => {
	const viewer = locals.user ? { id: locals.user.id, role: locals.user.role } : null;
	const profile = await getPublicProfile(params.id, viewer);
	if (!profile) error(404, 'There is no such installer.');
	return { profile };
};

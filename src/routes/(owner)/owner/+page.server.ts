import { requireRole } from '$lib/server/guards';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = () => {
	const owner = requireRole('owner');
	return { displayName: owner.displayName, emailVerified: owner.emailVerified };
};

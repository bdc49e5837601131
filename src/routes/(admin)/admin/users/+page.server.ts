import { requireRole } from '$lib/server/http/guards';
import { searchUsers, USERS_PAGE_SIZE } from '$lib/server/people/admin-users';
import { userQuerySchema } from '$lib/forms/admin';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	requireRole('admin');
	const query = userQuerySchema.parse(Object.fromEntries(url.searchParams));
	const found = await searchUsers(query);
	return {
		query,
		...found,
		pageCount: Math.max(1, Math.ceil(found.total / USERS_PAGE_SIZE))
	};
};

import { takeNotice } from '$lib/server/http/notice';
import { getAdminQueueCounts } from '$lib/server/metrics';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async ({ locals, cookies }) => {
	// Only fields that are safe to show in the browser.
	const user = locals.user
		? {
				displayName: locals.user.displayName,
				role: locals.user.role,
				emailVerified: locals.user.emailVerified
			}
		: null;
	// Admins see what waits on them beside the navigation, on every page.
	const queues = locals.user?.role === 'admin' ? await getAdminQueueCounts() : null;
	return { user, queues, notice: takeNotice(cookies) };
};

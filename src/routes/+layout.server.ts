import { takeNotice } from '$lib/server/http/notice';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = ({ locals, cookies }) => {
	// Only fields that are safe to show in the browser.
	const user = locals.user
		? {
				displayName: locals.user.displayName,
				role: locals.user.role,
				emailVerified: locals.user.emailVerified
			}
		: null;
	return { user, notice: takeNotice(cookies) };
};

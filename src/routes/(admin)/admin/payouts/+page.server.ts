import { payoutQuerySchema } from '$lib/forms/admin';
import {
	listPayoutsForAdmin,
	PAYOUTS_PAGE_SIZE,
	summarisePayouts
} from '$lib/server/money/admin-payouts';
import { requireRole } from '$lib/server/http/guards';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	requireRole('admin');
	const query = payoutQuerySchema.parse(Object.fromEntries(url.searchParams));
	const [rows, summary] = await Promise.all([
		listPayoutsForAdmin(query, {
			limit: PAYOUTS_PAGE_SIZE,
			offset: (query.page - 1) * PAYOUTS_PAGE_SIZE
		}),
		summarisePayouts(query)
	]);
	return {
		query,
		rows,
		summary,
		pageCount: Math.max(1, Math.ceil(summary.count / PAYOUTS_PAGE_SIZE))
	};
};

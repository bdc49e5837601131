import { bookingQuerySchema } from '$lib/forms/admin';
import {
	BOOKINGS_PAGE_SIZE,
	countBookingsForAdmin,
	listBookingsForAdmin
} from '$lib/server/marketplace/admin-bookings';
import { requireRole } from '$lib/server/http/guards';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	requireRole('admin');
	const query = bookingQuerySchema.parse(Object.fromEntries(url.searchParams));
	const rows = await listBookingsForAdmin(query, {
		limit: BOOKINGS_PAGE_SIZE,
		offset: (query.page - 1) * BOOKINGS_PAGE_SIZE
	});
	const total = await countBookingsForAdmin(query);
	return { query, rows, total, pageCount: Math.max(1, Math.ceil(total / BOOKINGS_PAGE_SIZE)) };
};

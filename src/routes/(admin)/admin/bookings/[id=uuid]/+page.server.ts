import { error } from '@sveltejs/kit';
import { getBookingTimeline } from '$lib/server/marketplace/admin-bookings';
import { requireRole } from '$lib/server/http/guards';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	requireRole('admin');
	const found = await getBookingTimeline(params.id);
	if (!found) error(404, 'There is no booking with that id.');
	return found;
};

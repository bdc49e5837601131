import { requireRole } from '$lib/server/http/guards';
import { orError } from '$lib/server/http/respond';
import { getBookingCalendarFile } from '$lib/server/work/booking-calendar';
import type { RequestHandler } from './$types';

/** The booking as a calendar file, for its installer only. */
export const GET: RequestHandler = async ({ params }) => {
	const me = requireRole('installer');
	const { ics } = orError(
		await getBookingCalendarFile(params.id, { id: me.id, side: 'installer' })
	);
	return new Response(ics, {
		headers: {
			'content-type': 'text/calendar; charset=utf-8',
			'content-disposition': 'attachment; filename="tapline-booking.ics"',
			'cache-control': 'private, no-store'
		}
	});
};

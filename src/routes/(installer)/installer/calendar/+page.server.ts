import { error } from '@sveltejs/kit';
import { addCalendarDays } from '$lib/work/calendar-week';
import { formatDay } from '$lib/time';
import { getInstallerWeek } from '$lib/server/work/booking-calendar';
import { requireRole } from '$lib/server/http/guards';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const installer = requireRole('installer');
	const now = new Date();
	const week = await getInstallerWeek(installer.id, url.searchParams.get('week'), now);
	if (!week) error(404, 'Your calendar starts once your installer application is made.');
	return {
		...week,
		heading: `${formatDay(week.monday, week.zone, now)} – ${formatDay(addCalendarDays(week.monday, 6), week.zone, now)}`,
		previous: addCalendarDays(week.monday, -7),
		next: addCalendarDays(week.monday, 7),
		booked: week.days.some((d) => d.bookings.length > 0)
	};
};

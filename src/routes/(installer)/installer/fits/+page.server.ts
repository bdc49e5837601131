import { fitRow, pageNumber } from '$lib/work/day-rows';
import { requireRole } from '$lib/server/http/guards';
import { DAY_PAGE_SIZE, listUpcomingFits } from '$lib/server/work/installer-day';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const installer = requireRole('installer');
	const page = pageNumber(url.searchParams.get('page'));
	const now = new Date();
	const fits = await listUpcomingFits(
		installer.id,
		{ limit: DAY_PAGE_SIZE, offset: (page - 1) * DAY_PAGE_SIZE },
		now
	);
	return { page, more: fits.more, fits: fits.rows.map((f) => fitRow(f, fits.timeZone, now)) };
};

import { pageNumber, threadRow } from '$lib/work/day-rows';
import { requireRole } from '$lib/server/http/guards';
import { getInstallerProfile } from '$lib/server/people/installers';
import { DAY_PAGE_SIZE, listRecentThreads } from '$lib/server/work/installer-day';
import { DEFAULT_TIME_ZONE } from '$lib/time';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const installer = requireRole('installer');
	const page = pageNumber(url.searchParams.get('page'));
	const now = new Date();
	const [profile, threads] = await Promise.all([
		getInstallerProfile(installer.id),
		listRecentThreads(installer.id, { limit: DAY_PAGE_SIZE, offset: (page - 1) * DAY_PAGE_SIZE })
	]);
	const zone = profile?.timeZone ?? DEFAULT_TIME_ZONE;
	return {
		page,
		more: threads.more,
		threads: threads.rows.map((t) => threadRow(t, zone, now))
	};
};

import { pageNumber, waitingQuoteRow } from '$lib/work/day-rows';
import { requireRole } from '$lib/server/http/guards';
import { getInstallerProfile } from '$lib/server/people/installers';
import { DAY_PAGE_SIZE, listQuotesAwaitingAnswer } from '$lib/server/work/installer-day';
import { DEFAULT_TIME_ZONE } from '$lib/time';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const installer = requireRole('installer');
	const page = pageNumber(url.searchParams.get('page'));
	const now = new Date();
	const [profile, quotes] = await Promise.all([
		getInstallerProfile(installer.id),
		listQuotesAwaitingAnswer(
			installer.id,
			{ limit: DAY_PAGE_SIZE, offset: (page - 1) * DAY_PAGE_SIZE },
			now
		)
	]);
	const zone = profile?.timeZone ?? DEFAULT_TIME_ZONE;
	return { page, more: quotes.more, quotes: quotes.rows.map((q) => waitingQuoteRow(q, zone, now)) };
};

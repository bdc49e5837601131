import { requireRole } from '$lib/server/http/guards';
import { getMarketMetrics, getPlatformCounts } from '$lib/server/metrics';
import type { PageServerLoad } from './$types';

/** Weeks the overview looks back over, the current one included. */
const OVERVIEW_WEEKS = 12;

export const load: PageServerLoad = async () => {
	requireRole('admin');
	const [counts, market] = await Promise.all([
		getPlatformCounts(),
		getMarketMetrics(new Date(), OVERVIEW_WEEKS)
	]);
	return { counts, market, weeks: OVERVIEW_WEEKS };
};

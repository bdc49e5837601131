import { requireRole } from '$lib/server/http/guards';
import { getMarketMetrics, getPlatformCounts } from '$lib/server/metrics';
import { getMoneyMetrics } from '$lib/server/money/money-metrics';
import type { PageServerLoad } from './$types';

/** Weeks the overview looks back over, the current one included. */
const OVERVIEW_WEEKS = 12;

export const load: PageServerLoad = async () => {
	requireRole('admin');
	const now = new Date();
	const [counts, market, money] = await Promise.all([
		getPlatformCounts(),
		getMarketMetrics(now, OVERVIEW_WEEKS),
		getMoneyMetrics(now, OVERVIEW_WEEKS)
	]);
	return { counts, market, money, weeks: OVERVIEW_WEEKS };
};

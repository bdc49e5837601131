import { requireRole } from '$lib/server/http/guards';
import { getPlatformCounts } from '$lib/server/metrics';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	requireRole('admin');
	return { counts: await getPlatformCounts() };
};

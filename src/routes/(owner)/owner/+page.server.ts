import { z } from 'zod';
import { requireRole } from '$lib/server/http/guards';
import { JOB_SORTS, listOwnerJobs } from '$lib/server/marketplace/jobs';
import { listNotices } from '$lib/server/notices';
import type { PageServerLoad } from './$types';

const PAGE_SIZE = 10;
const querySchema = z.object({
	sort: z.enum(JOB_SORTS).catch('created'),
	dir: z.enum(['asc', 'desc']).catch('desc'),
	page: z.coerce.number().int().min(1).max(10_000).catch(1)
});

export const load: PageServerLoad = async ({ url }) => {
	const owner = requireRole('owner');
	const query = querySchema.parse(Object.fromEntries(url.searchParams));
	const [{ rows, total }, notices] = await Promise.all([
		listOwnerJobs(owner.id, { ...query, pageSize: PAGE_SIZE }),
		listNotices(owner.id)
	]);
	return {
		displayName: owner.displayName,
		emailVerified: owner.emailVerified,
		jobs: rows,
		total,
		query,
		pages: Math.max(1, Math.ceil(total / PAGE_SIZE)),
		notices: notices.map((n) => ({ ...n, createdAt: n.createdAt.toISOString() }))
	};
};

import { z } from 'zod';
import { listDisputes } from '$lib/server/work/disputes';
import { requireRole } from '$lib/server/http/guards';
import type { PageServerLoad } from './$types';

const querySchema = z.object({
	status: z.enum(['open', 'settled']).catch('open'),
	page: z.coerce.number().int().min(1).max(100_000).catch(1)
});

export const load: PageServerLoad = async ({ url }) => {
	requireRole('admin');
	const q = querySchema.parse(Object.fromEntries(url.searchParams));
	return { status: q.status, queue: await listDisputes(q.status, q.page) };
};

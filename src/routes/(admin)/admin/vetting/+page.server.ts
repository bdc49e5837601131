import { requireRole } from '$lib/server/http/guards';
import { listVettingQueue } from '$lib/server/people/vetting';
import { QUEUE_SORTS, type QueueSort } from '$lib/people/vetting';
import { VETTING_STATUSES, type VettingStatus } from '$lib/people/vetting';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	requireRole('admin');
	const statusParam = url.searchParams.get('status') ?? '';
	const status = VETTING_STATUSES.includes(statusParam as VettingStatus)
		? (statusParam as VettingStatus)
		: null;
	const sortParam = url.searchParams.get('sort') ?? '';
	const sort: QueueSort = QUEUE_SORTS.includes(sortParam as QueueSort)
		? (sortParam as QueueSort)
		: 'oldest';
	const pageParam = Number(url.searchParams.get('page'));
	const page = Number.isSafeInteger(pageParam) && pageParam > 0 ? pageParam : 1;
	const queue = await listVettingQueue({ status, sort, page });
	return { queue, status, sort };
};

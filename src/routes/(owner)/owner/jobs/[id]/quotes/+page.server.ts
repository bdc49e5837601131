import { error } from '@sveltejs/kit';
import { z } from 'zod';
import { bestFitFormula, priceReferenceCents } from '$lib/ranking';
import { getLiveBookingForJob, lapseExpiredHolds } from '$lib/server/bookings';
import { requireRole } from '$lib/server/guards';
import { getOwnedJob } from '$lib/server/jobs';
import { requestEmailDelivery } from '$lib/server/queue';
import { listAskingInstallers, listQuotesForOwner } from '$lib/server/quotes';
import { COMPARISON_SORTS, compareQuotes, type ComparisonSort } from './comparison';
import type { PageServerLoad } from './$types';

const sortSchema = z.object({
	sort: z
		.enum(Object.keys(COMPARISON_SORTS) as [ComparisonSort, ...ComparisonSort[]])
		.catch('best'),
	dir: z.enum(['asc', 'desc']).optional().catch(undefined)
});
// Bigger is better for these, so they start highest first.
const DESCENDING_FIRST: readonly ComparisonSort[] = ['rating', 'fits', 'warranty', 'expiry'];

export const load: PageServerLoad = async ({ params, url }) => {
	const owner = requireRole('owner');
	// A hold that ran out is lapsed on sight, so the owner never sees a stale "booked".
	await requestEmailDelivery(await lapseExpiredHolds({ jobId: params.id }));
	const job = await getOwnedJob(params.id, owner.id);
	if (!job) error(404, 'There is no such job among yours.');
	const { sort, dir: asked } = sortSchema.parse(Object.fromEntries(url.searchParams));
	const dir = asked ?? (DESCENDING_FIRST.includes(sort) ? 'desc' : 'asc');
	const reference = priceReferenceCents({
		lowCents: job.priceLowCents,
		highCents: job.priceHighCents
	});
	const [quotes, asking, booking] = await Promise.all([
		listQuotesForOwner(job.id, owner.id),
		listAskingInstallers(job.id),
		getLiveBookingForJob(job.id)
	]);
	return {
		job: { id: job.id, title: job.title ?? 'Your job', status: job.status, timeZone: job.timeZone },
		rows: compareQuotes(quotes ?? [], sort, dir, reference),
		asking,
		booking,
		sort,
		dir,
		formula: bestFitFormula(reference)
	};
};

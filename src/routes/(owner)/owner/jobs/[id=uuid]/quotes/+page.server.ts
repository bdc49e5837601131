import { error } from '@sveltejs/kit';
import { z } from 'zod';
import { bestFitFormula, priceReferenceCents } from '$lib/marketplace/ranking';
import { jobStatusShown, quoteStatusShown } from '$lib/marketplace/holds';
import { getLiveBookingForJob } from '$lib/server/marketplace/bookings';
import { requireRole } from '$lib/server/http/guards';
import { getOwnedJob } from '$lib/server/marketplace/jobs';
import { listAskingInstallers } from '$lib/server/marketplace/threads';
import { listQuotesForOwner } from '$lib/server/marketplace/quotes';
import { COMPARISON_SORTS, compareQuotes, type ComparisonSort } from './comparison';
import { NOT_YOUR_JOB } from '$lib/server/refusal';
import type { PageServerLoad } from './$types';
import { titleOrUntitled } from '$lib/marketplace/posted-job';

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
	const job = await getOwnedJob(params.id, owner.id);
	if (!job) error(404, NOT_YOUR_JOB);
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
		job: {
			id: job.id,
			title: titleOrUntitled(job.title),
			// A hold that ran out reads as over at once, so the owner never sees a stale "booked".
			status: jobStatusShown(job.status, booking !== null),
			timeZone: job.timeZone
		},
		rows: compareQuotes(
			(quotes ?? []).map((q) => ({ ...q, status: quoteStatusShown(q.status, booking !== null) })),
			sort,
			dir,
			reference
		),
		asking,
		booking,
		sort,
		dir,
		formula: bestFitFormula(reference)
	};
};

import { error } from '@sveltejs/kit';
import { pageNumber } from '$lib/work/day-rows';
import { ratingSummary } from '$lib/marketplace/ranking';
import { getPublicProfile } from '$lib/server/people/installers';
import { listInstallerReviews } from '$lib/server/work/reviews';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, locals, url }) => {
	const viewer = locals.user ? { id: locals.user.id, role: locals.user.role } : null;
	const profile = await getPublicProfile(params.id, viewer);
	if (!profile) error(404, 'There is no such installer.');
	const page = pageNumber(url.searchParams.get('page'));
	const reviews = await listInstallerReviews(params.id, page);
	// The same adjusted rating the owners' quote ranking uses (prior stated in $lib/marketplace/ranking).
	return { profile, page, reviews, rating: ratingSummary(reviews.sum, reviews.count) };
};

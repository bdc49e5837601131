import { error, json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/http/guards';
import {
	boardQuerySchema,
	getInstallerContext,
	searchBoard
} from '$lib/server/marketplace/matching';
import type { RequestHandler } from './$types';

/**
 * The installer's job board as JSON: open jobs offered to the signed-in installer, at their
 * approximate (grid-cell) location, filtered, sorted and paged by cursor, with the map's clusters
 * when a zoom is given. Never a job's true point. Documented in README.md.
 */
export const GET: RequestHandler = async ({ url, locals }) => {
	// A JSON client wants a status code, not the sign-in redirect requireRole gives pages.
	if (!locals.user) error(401, 'Sign in as an installer to see the job board.');
	if (locals.user.role !== 'installer') error(403, 'The job board is for installers.');
	const installer = requireRole('installer');
	const parsed = boardQuerySchema.safeParse(Object.fromEntries(url.searchParams));
	if (!parsed.success) {
		error(400, parsed.error.issues.map((i) => i.message).join('; '));
	}
	const context = await getInstallerContext(installer.id);
	if (!context?.canQuote) {
		error(403, 'Only vetted installers whose quoting is not paused can see open jobs.');
	}
	const page = await searchBoard(context, parsed.data);
	if (!page) error(400, 'cursor is not one this API gave out; start again without it');
	return json({
		jobs: page.jobs,
		nextCursor: page.nextCursor,
		total: page.total,
		clusters: page.clusters,
		circle: { ...context.base, radiusKm: context.serviceRadiusKm }
	});
};

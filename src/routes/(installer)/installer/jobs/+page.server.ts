import { requireRole } from '$lib/server/http/guards';
import {
	boardQuerySchema,
	getInstallerContext,
	listNewOfferedJobs,
	searchBoard
} from '$lib/server/marketplace/matching';
import type { PageServerLoad } from './$types';

// The board loads in the browser from /api/jobs as the map moves; this first page (from the same
// query parameters) is what shows before the map is ready and without JavaScript. It is one
// indexed page and nothing more: the total and the map's clusters come with the browser's first
// request, so the first paint costs the same whatever the size of the market.
export const load: PageServerLoad = async ({ url }) => {
	const installer = requireRole('installer');
	const context = await getInstallerContext(installer.id);
	if (!context?.canQuote) {
		return {
			ready: false as const,
			reason: !context
				? 'Apply to quote first: your job board opens once an admin has vetted you.'
				: context.pausedReason
					? `Your quoting is paused: ${context.pausedReason}`
					: 'Your job board opens once an admin has vetted your application.'
		};
	}
	const raw = Object.fromEntries(url.searchParams);
	const parsed = boardQuerySchema.safeParse(raw);
	const query = parsed.success ? parsed.data : boardQuerySchema.parse({});
	const [first, fresh] = await Promise.all([
		searchBoard(context, { ...query, bounds: undefined, zoom: undefined }, { counted: false }),
		listNewOfferedJobs(context)
	]);
	return {
		ready: true as const,
		circle: { ...context.base, radiusKm: context.serviceRadiusKm },
		initial: first ?? { jobs: [], nextCursor: null, total: null, clusters: null },
		query: {
			bodyStyle: query.bodyStyle ?? '',
			cameras: query.cameras ?? '',
			power: query.power ?? '',
			maxKm: query.maxKm === undefined ? '' : String(query.maxKm),
			unquoted: Boolean(query.unquoted),
			sort: query.sort,
			dir: query.dir ?? null
		},
		badQuery: parsed.success ? null : parsed.error.issues.map((i) => i.message).join('; '),
		newJobs: fresh.jobs
	};
};

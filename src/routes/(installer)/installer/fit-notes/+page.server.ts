import { error } from '@sveltejs/kit';
import { pageNumber } from '$lib/work/day-rows';
import { searchYear } from '$lib/fit-notes/fit-notes';
import { BODY_STYLES } from '$lib/scope/request';
import { requireRole } from '$lib/server/http/guards';
import { searchFitNotes } from '$lib/server/fit-notes/fit-notes';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const installer = requireRole('installer');
	const params = url.searchParams;
	// Search words are bounded like the make and model a note holds; NUL never reaches SQL (hooks).
	const q = (params.get('q') ?? '').slice(0, 100);
	const yearText = (params.get('year') ?? '').slice(0, 10);
	const body = params.get('body') ?? '';
	const bodyStyle = (BODY_STYLES as readonly string[]).includes(body) ? body : null;
	const page = pageNumber(params.get('page'));
	const year = searchYear(yearText);
	const found = await searchFitNotes(installer.id, { q, year, bodyStyle, page });
	if (!found.ok) error(found.status, found.message);
	return {
		q,
		yearText,
		yearIgnored: yearText.trim() !== '' && year === null,
		bodyStyle,
		page,
		more: found.more,
		searched: q.trim() !== '' || year !== null || bodyStyle !== null,
		notes: found.rows.map((n) => ({ ...n, createdAt: n.createdAt.toISOString() }))
	};
};

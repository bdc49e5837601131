import { error } from '@sveltejs/kit';
import {
	NOT_YOUR_BOOKING,
	getInstallRecord,
	installRecordView
} from '$lib/server/work/fit-reports';
import { requireRole } from '$lib/server/http/guards';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const viewer = requireRole('installer');
	const record = await getInstallRecord(params.id, viewer);
	if (!record) error(404, NOT_YOUR_BOOKING);
	return { record: installRecordView(record) };
};

import { redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/http/guards';
import { createDraftJob } from '$lib/server/marketplace/jobs';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => {
	requireRole('owner');
};

export const actions = {
	default: async () => {
		const owner = requireRole('owner');
		const id = await createDraftJob(owner.id);
		redirect(303, `/owner/jobs/${id}/vehicle`);
	}
} satisfies Actions;

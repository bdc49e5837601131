import { error, fail, redirect } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { withdrawSchema } from '$lib/forms/job';
import { requireRole } from '$lib/server/guards';
import { getOwnedJob, listJobPhotos, withdrawJob } from '$lib/server/jobs';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params, url }) => {
	const owner = requireRole('owner');
	const job = await getOwnedJob(params.id, owner.id);
	if (!job) error(404, 'There is no such job among yours.');
	const [photos, withdrawForm] = await Promise.all([
		listJobPhotos(job.id),
		superValidate(zod4(withdrawSchema), { errors: false })
	]);
	const { draft: _draft, ...shown } = job;
	return { job: shown, photos, withdrawForm, justPosted: url.searchParams.has('posted') };
};

export const actions = {
	withdraw: async ({ request, params }) => {
		const owner = requireRole('owner');
		const form = await superValidate(request, zod4(withdrawSchema));
		if (!form.valid) return fail(400, { withdrawForm: form });
		const result = await withdrawJob(params.id, owner.id, form.data.reason);
		if (result === 'not-found') error(404, 'There is no such job among yours.');
		if (result === 'locked') {
			return message(
				form,
				'A booked job cannot be withdrawn here; contact the installer or raise a dispute.',
				{ status: 409 }
			);
		}
		redirect(303, `/owner/jobs/${params.id}`);
	}
} satisfies Actions;

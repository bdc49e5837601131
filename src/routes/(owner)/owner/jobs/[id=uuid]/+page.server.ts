import { error, fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { withdrawSchema } from '$lib/forms/job';
import { requireRole } from '$lib/server/http/guards';
import { getLiveBookingForJob } from '$lib/server/bookings';
import { getOwnedJob, listJobPhotos, withdrawJob } from '$lib/server/jobs';
import { NOT_YOUR_JOB } from '$lib/server/refusal';
import { refusalMessage } from '$lib/server/http/respond';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const owner = requireRole('owner');
	const job = await getOwnedJob(params.id, owner.id);
	if (!job) error(404, NOT_YOUR_JOB);
	const [photos, withdrawForm, booking] = await Promise.all([
		listJobPhotos(job.id),
		superValidate(zod4(withdrawSchema), { errors: false }),
		getLiveBookingForJob(job.id)
	]);
	const { draft: _draft, ...shown } = job;
	return { job: shown, photos, withdrawForm, booking };
};

export const actions = {
	withdraw: async ({ request, params }) => {
		const owner = requireRole('owner');
		const form = await superValidate(request, zod4(withdrawSchema));
		if (!form.valid) return fail(400, { withdrawForm: form });
		const result = await withdrawJob(params.id, owner.id, form.data.reason);
		if (!result.ok) return refusalMessage(form, result);
		redirect(303, `/owner/jobs/${params.id}`);
	}
} satisfies Actions;

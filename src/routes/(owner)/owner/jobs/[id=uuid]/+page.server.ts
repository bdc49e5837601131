import { error, fail, redirect } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { adjustJobSchema, chosenWindows, withdrawSchema } from '$lib/forms/job';
import { requireRole } from '$lib/server/http/guards';
import { getLiveBookingForJob } from '$lib/server/marketplace/bookings';
import {
	adjustOpenJob,
	getOwnedJob,
	listJobPhotos,
	withdrawJob
} from '$lib/server/marketplace/jobs';
import { NOT_YOUR_JOB } from '$lib/server/refusal';
import { refusalMessage } from '$lib/server/http/respond';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async ({ params }) => {
	const owner = requireRole('owner');
	const job = await getOwnedJob(params.id, owner.id);
	if (!job) error(404, NOT_YOUR_JOB);
	const dates = Object.fromEntries(
		job.preferredWindows.flatMap((w, i) => [
			[`date${String(i + 1)}`, w.date],
			[`window${String(i + 1)}`, w.window]
		])
	);
	const [photos, withdrawForm, adjustForm, booking] = await Promise.all([
		listJobPhotos(job.id),
		superValidate(zod4(withdrawSchema), { errors: false }),
		superValidate({ ...dates, note: job.ownerNote ?? '' }, zod4(adjustJobSchema), {
			errors: false,
			id: 'adjust'
		}),
		getLiveBookingForJob(job.id)
	]);
	const { draft: _draft, ...shown } = job;
	return { job: shown, photos, withdrawForm, adjustForm, booking };
};

export const actions = {
	adjust: async ({ request, params }) => {
		const owner = requireRole('owner');
		const form = await readForm(request, zod4(adjustJobSchema), { id: 'adjust' });
		if (!form.valid) return fail(400, { adjustForm: form });
		const result = await adjustOpenJob(params.id, owner.id, {
			windows: chosenWindows(form.data),
			note: form.data.note
		});
		if (!result.ok) return refusalMessage(form, result);
		return message(
			form,
			result.told === 0
				? 'Saved.'
				: `Saved, and the ${result.told === 1 ? 'installer who quoted was' : `${String(result.told)} installers who quoted were`} told.`
		);
	},
	withdraw: async ({ request, params }) => {
		const owner = requireRole('owner');
		const form = await readForm(request, zod4(withdrawSchema));
		if (!form.valid) return fail(400, { withdrawForm: form });
		const result = await withdrawJob(params.id, owner.id, form.data.reason);
		if (!result.ok) return refusalMessage(form, result);
		redirect(303, `/owner/jobs/${params.id}`);
	}
} satisfies Actions;

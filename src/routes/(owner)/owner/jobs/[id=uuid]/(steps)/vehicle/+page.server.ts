import { fail } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { vehicleStepSchema } from '$lib/forms/job';
import { saveJobStep } from '$lib/server/marketplace/jobs';
import { finishStep, loadEditableJob } from '../editable-job';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async ({ params }) => {
	const { job } = await loadEditableJob(params.id);
	return { form: await superValidate(job.draft, zod4(vehicleStepSchema), { errors: false }) };
};

export const actions = {
	default: async ({ request, params }) => {
		const { owner } = await loadEditableJob(params.id);
		const form = await readForm(request, zod4(vehicleStepSchema));
		if (!form.valid) return fail(400, { form });
		const title = `${form.data.year} ${form.data.make} ${form.data.model}`;
		const result = await saveJobStep(params.id, owner.id, 'vehicle', form.data, { title });
		return finishStep(result, form, params.id, 'vehicle');
	}
} satisfies Actions;

import { fail } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { camerasStepSchema } from '$lib/forms/job';
import { saveJobStep } from '$lib/server/marketplace/jobs';
import { finishStep, loadEditableJob } from '../editable-job';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async ({ params }) => {
	const { job } = await loadEditableJob(params.id);
	const cents = job.draft.cameraBudgetCents;
	const initial = {
		...job.draft,
		cameraBudgetDollars: typeof cents === 'number' ? Math.round(cents / 100) : undefined
	};
	return { form: await superValidate(initial, zod4(camerasStepSchema), { errors: false }) };
};

export const actions = {
	default: async ({ request, params }) => {
		const { owner } = await loadEditableJob(params.id);
		const form = await readForm(request, zod4(camerasStepSchema));
		if (!form.valid) return fail(400, { form });
		const { cameraBudgetDollars, ...rest } = form.data;
		const values = {
			...rest,
			cameraBudgetCents:
				rest.cameraSupply === 'installer' && cameraBudgetDollars !== undefined
					? cameraBudgetDollars * 100
					: undefined
		};
		const result = await saveJobStep(params.id, owner.id, 'cameras', values, {
			cameras: rest.cameras
		});
		return finishStep(result, form, params.id, 'cameras');
	}
} satisfies Actions;

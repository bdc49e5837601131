import { fail } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { powerStepSchema } from '$lib/forms/job';
import { saveJobStep } from '$lib/server/marketplace/jobs';
import { finishStep, loadEditableJob } from '../editable-job';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async ({ params }) => {
	const { job } = await loadEditableJob(params.id);
	return {
		form: await superValidate(job.draft, zod4(powerStepSchema), { errors: false }),
		batteryType: typeof job.draft.batteryType === 'string' ? job.draft.batteryType : 'unknown',
		startStop: job.draft.startStop === true,
		hybridOrEv: job.draft.hybridOrEv === true,
		cameras: typeof job.draft.cameras === 'string' ? job.draft.cameras : 'front'
	};
};

export const actions = {
	default: async ({ request, params }) => {
		const { owner } = await loadEditableJob(params.id);
		const form = await readForm(request, zod4(powerStepSchema));
		if (!form.valid) return fail(400, { form });
		const parking = form.data.power === 'hardwired-parking' || form.data.power === 'obd';
		const values = parking
			? form.data
			: {
					power: form.data.power,
					parkingDrawMilliamps: undefined,
					cutOffVolts: undefined,
					restVolts: undefined
				};
		const result = await saveJobStep(params.id, owner.id, 'power', values, {
			power: form.data.power
		});
		return finishStep(result, form, params.id, 'power');
	}
} satisfies Actions;

import { error, fail } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { decisionSchema } from '$lib/forms/vetting';
import { requireRole } from '$lib/server/http/guards';
import { decideApplication, getApplicationForReview } from '$lib/server/people/vetting';
import { refusalMessage } from '$lib/server/http/respond';
import { DECISION_LABELS } from '$lib/labels';
import { redirectWithNotice } from '$lib/server/http/notice';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async ({ params }) => {
	requireRole('admin');
	const application = await getApplicationForReview(params.id);
	if (!application) error(404, 'There is no such application.');
	const form = await superValidate(
		{ expectedStatus: application.profile.vettingStatus },
		zod4(decisionSchema),
		{ errors: false }
	);
	return { application, form };
};

export const actions = {
	decide: async ({ request, params, cookies }) => {
		const admin = requireRole('admin');
		const form = await readForm(request, zod4(decisionSchema));
		if (!form.valid) return fail(400, { form });
		const { decision, expectedStatus, message: text, ...checklist } = form.data;
		const result = await decideApplication({
			adminId: admin.id,
			installerId: params.id,
			decision,
			expectedStatus,
			message: text,
			checklist
		});
		if (!result.ok) return refusalMessage(form, result);
		redirectWithNotice(
			cookies,
			`/admin/vetting/${params.id}`,
			`${DECISION_LABELS[decision]}: recorded, and the installer has been e-mailed.`
		);
	}
} satisfies Actions;

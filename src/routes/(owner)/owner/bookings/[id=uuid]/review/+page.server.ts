import { error, fail } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { ownerReviewSchema, starsNotWhole } from '$lib/forms/review';
import { requireRole } from '$lib/server/http/guards';
import { redirectWithNotice } from '$lib/server/http/notice';
import { refusalMessage } from '$lib/server/http/respond';
import { getReviewPanel, submitReview } from '$lib/server/work/reviews';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';
import { readFormData } from '$lib/server/http/form-data';

const NOT_FOUND = 'There is no such booking among yours.';

export const load: PageServerLoad = async ({ params }) => {
	const owner = requireRole('owner');
	const panel = await getReviewPanel(params.id, owner.id, 'owner');
	if (!panel) error(404, NOT_FOUND);
	return { panel, form: await superValidate(zod4(ownerReviewSchema)) };
};

export const actions = {
	review: async ({ params, request, cookies }) => {
		const owner = requireRole('owner');
		const posted = await readFormData(request);
		const form = await readForm(posted ?? new FormData(), zod4(ownerReviewSchema));
		if (!form.valid) return fail(400, { form });
		const notWhole = starsNotWhole(posted, ownerReviewSchema);
		if (notWhole.length > 0)
			return setError(form, notWhole[0] as never, 'Choose from 1 to 5 stars');
		const result = await submitReview(params.id, owner.id, 'owner', form.data);
		if (!result.ok) return refusalMessage(form, result);
		redirectWithNotice(
			cookies,
			`/owner/bookings/${params.id}/review`,
			'Thank you: your review is saved.'
		);
	}
} satisfies Actions;

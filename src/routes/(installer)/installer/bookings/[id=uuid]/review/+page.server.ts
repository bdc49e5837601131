import { error, fail } from '@sveltejs/kit';
import { setError, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { installerReviewSchema, reviewReplySchema, starsNotWhole } from '$lib/forms/review';
import { requireRole } from '$lib/server/http/guards';
import { redirectWithNotice } from '$lib/server/http/notice';
import { refusalMessage } from '$lib/server/http/respond';
import { getReviewPanel, replyToReview, submitReview } from '$lib/server/work/reviews';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';
import { readFormData } from '$lib/server/http/form-data';

const NOT_FOUND = 'There is no such booking among yours.';

export const load: PageServerLoad = async ({ params }) => {
	const installer = requireRole('installer');
	const panel = await getReviewPanel(params.id, installer.id, 'installer');
	if (!panel) error(404, NOT_FOUND);
	const [form, replyForm] = await Promise.all([
		superValidate(zod4(installerReviewSchema)),
		superValidate(zod4(reviewReplySchema), { id: 'reply' })
	]);
	return { panel, form, replyForm };
};

export const actions = {
	review: async ({ params, request, cookies }) => {
		const installer = requireRole('installer');
		const posted = await readFormData(request);
		const form = await readForm(posted ?? new FormData(), zod4(installerReviewSchema));
		if (!form.valid) return fail(400, { form });
		const notWhole = starsNotWhole(posted, installerReviewSchema);
		if (notWhole.length > 0)
			return setError(form, notWhole[0] as never, 'Choose from 1 to 5 stars');
		const result = await submitReview(params.id, installer.id, 'installer', form.data);
		if (!result.ok) return refusalMessage(form, result);
		redirectWithNotice(
			cookies,
			`/installer/bookings/${params.id}/review`,
			'Thank you: your review is saved.'
		);
	},
	reply: async ({ params, request, cookies }) => {
		const installer = requireRole('installer');
		const replyForm = await readForm(request, zod4(reviewReplySchema), { id: 'reply' });
		if (!replyForm.valid) return fail(400, { replyForm });
		const result = await replyToReview(params.id, installer.id, replyForm.data.reply);
		if (!result.ok) return refusalMessage(replyForm, result);
		redirectWithNotice(
			cookies,
			`/installer/bookings/${params.id}/review`,
			'Your reply shows under the review.'
		);
	}
} satisfies Actions;

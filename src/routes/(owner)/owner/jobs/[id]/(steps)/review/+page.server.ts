import { error, fail, redirect } from '@sveltejs/kit';
import { computeScope, jobRequestSchema } from '$lib/scope';
import { draftProblems, postJob } from '$lib/server/jobs';
import { loadEditableJob } from '$lib/server/owner-jobs';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const { job } = await loadEditableJob(params.id);
	const problems = draftProblems(job);
	const parsed = jobRequestSchema.safeParse(job.draft);
	return {
		problems,
		scope: parsed.success ? computeScope(parsed.data) : null,
		posted: job.status !== 'drafting',
		place: job.suburb,
		windows: job.preferredWindows
	};
};

export const actions = {
	post: async ({ params }) => {
		const { owner } = await loadEditableJob(params.id);
		const result = await postJob(params.id, owner.id);
		if (result === 'not-found') error(404, 'There is no such job among yours.');
		if (result === 'locked') {
			return fail(409, {
				problems: [
					{
						step: 'review',
						message: 'This job has a quote or booking now and can no longer change.'
					}
				]
			});
		}
		if (Array.isArray(result)) return fail(400, { problems: result });
		redirect(303, `/owner/jobs/${params.id}?posted=1`);
	}
} satisfies Actions;

import { error, fail } from '@sveltejs/kit';
import { redirectWithNotice } from '$lib/server/http/notice';
import type { JobStep } from '$lib/forms/job';
import { computeScope, jobRequestSchema } from '$lib/scope';
import { draftProblems, listJobPhotos, postJob } from '$lib/server/marketplace/jobs';
import { loadEditableJob } from '../editable-job';
import { requireConfirmedRole } from '$lib/server/http/guards';
import { getMarketSettings, scopeMarketOf } from '$lib/server/money/settings';
import { countFitsOfBodyStyle, similarFitMinutes } from '$lib/server/marketplace/calibration';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const { job } = await loadEditableJob(params.id);
	const problems = draftProblems(job);
	const parsed = jobRequestSchema.safeParse(job.draft);
	const [photos, market, fitMinutes, bodyStyleFits] = await Promise.all([
		listJobPhotos(job.id),
		getMarketSettings(),
		parsed.success ? similarFitMinutes(parsed.data) : [],
		parsed.success ? countFitsOfBodyStyle(parsed.data.bodyStyle) : null
	]);
	return {
		// What the owner entered, shown above the sheet with a way back to each step.
		entered: parsed.success ? parsed.data : null,
		locationMode: job.locationMode,
		addressLine: job.addressLine,
		photos,
		problems,
		scope: parsed.success ? computeScope(parsed.data, scopeMarketOf(market), fitMinutes) : null,
		// Only a count: owners never see installers' fit notes.
		bodyStyleFits,
		posted: job.status !== 'drafting',
		place: job.suburb,
		windows: job.preferredWindows
	};
};

export const actions = {
	post: async ({ params, cookies }) => {
		requireConfirmedRole('owner');
		const { owner } = await loadEditableJob(params.id);
		const result = await postJob(params.id, owner.id);
		if (!result.ok) {
			if (result.status === 404) error(404, result.message);
			// A refused post names each step to fix; a locked job has only its message.
			const problems = Object.entries(result.fields ?? { review: result.message }).map(
				([step, message]) => ({ step: step as JobStep, message })
			);
			return fail(result.status, { problems });
		}
		redirectWithNotice(
			cookies,
			`/owner/jobs/${params.id}`,
			'Posted. Vetted installers near you can now see the scope sheet and quote.'
		);
	}
} satisfies Actions;

/** Request plumbing shared by the owner's job pages: find the job, refuse politely. */
import { error, redirect } from '@sveltejs/kit';
import { message, type SuperValidated } from 'sveltekit-superforms';
import { nextStep, type JobStep } from '$lib/forms/job';
import { requireRole } from './guards';
import { getOwnedJob, type JobChange } from './jobs';

/** The signed-in owner's job, 404 when it is not theirs, to the job page when it is locked. */
export async function loadEditableJob(jobId: string) {
	const owner = requireRole('owner');
	const found = await getOwnedJob(jobId, owner.id);
	if (!found) error(404, 'There is no such job among yours.');
	if (!found.editable) redirect(303, `/owner/jobs/${found.id}`);
	return { owner, job: found };
}

/** Ends a step's action: onwards on success, a clear refusal otherwise. */
export function finishStep<T extends Record<string, unknown>>(
	result: JobChange,
	form: SuperValidated<T>,
	jobId: string,
	step: JobStep
) {
	if (result === 'not-found') error(404, 'There is no such job among yours.');
	if (result === 'locked') {
		return message(
			form,
			'This job has a quote or a booking now, so its details can no longer change.',
			{ status: 409 }
		);
	}
	redirect(303, `/owner/jobs/${jobId}/${nextStep(step)}`);
}

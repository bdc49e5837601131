/** Request plumbing shared by the steps of an owner's job request: find the job, move on. */
import { error, redirect } from '@sveltejs/kit';
import type { SuperValidated } from 'sveltekit-superforms';
import { nextStep, type JobStep } from '$lib/forms/job';
import { requireRole } from '$lib/server/http/guards';
import { getOwnedJob, type JobChange } from '$lib/server/marketplace/jobs';
import { NOT_YOUR_JOB } from '$lib/server/refusal';
import { refusalMessage } from '$lib/server/http/respond';

/** The signed-in owner's job, 404 when it is not theirs, to the job page when it is locked. */
export async function loadEditableJob(jobId: string) {
	const owner = requireRole('owner');
	const found = await getOwnedJob(jobId, owner.id);
	if (!found) error(404, NOT_YOUR_JOB);
	if (!found.editable) redirect(303, `/owner/jobs/${found.id}`);
	return { owner, job: found };
}

/** Ends a step's action: onwards on success, the refusal on the form otherwise. */
export function finishStep<T extends Record<string, unknown>>(
	result: JobChange,
	form: SuperValidated<T>,
	jobId: string,
	step: JobStep
) {
	if (!result.ok) return refusalMessage(form, result);
	redirect(303, `/owner/jobs/${jobId}/${nextStep(step)}`);
}

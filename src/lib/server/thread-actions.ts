/**
 * The question-and-answer form action shared by the installer's job page and the owner's quote
 * page: post the message, refuse with the form's message on a 4xx, 404 when the thread is not
 * theirs, ask for e-mail delivery after commit.
 */
import { error } from '@sveltejs/kit';
import { message, type SuperValidated } from 'sveltekit-superforms';
import { postJobMessage } from './threads';

/** Posts `form.data.body` to the thread; returns the refusal to send back, or what was masked. */
export async function sendThreadMessage(
	form: SuperValidated<{ body: string }>,
	thread: { jobId: string; installerId: string },
	author: { id: string; role: 'owner' | 'installer' },
	notFound: string
) {
	const result = await postJobMessage(thread.jobId, thread.installerId, author, form.data.body);
	if (!result.ok) {
		if (result.status === 404) error(404, notFound);
		return { refusal: message(form, result.message, { status: result.status }) };
	}
	return { masked: result.masked };
}

/**
 * A message in a job's question-and-answer thread, from the installer or the owner: one schema for
 * both sides' forms.
 */
import { z } from 'zod';
import { textField } from './fields';

/** The longest message a thread takes (Tapline's bound: a question, not a document). */
export const THREAD_MESSAGE_MAX_LENGTH = 2000;

export const threadMessageSchema = z.object({
	body: textField({ error: 'Write your message' })
		.trim()
		.min(1, { error: 'Write your message' })
		.max(THREAD_MESSAGE_MAX_LENGTH, {
			error: `Keep it to ${THREAD_MESSAGE_MAX_LENGTH.toLocaleString('en-AU')} characters or fewer`
		})
});
export type ThreadMessageForm = z.output<typeof threadMessageSchema>;

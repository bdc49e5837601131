import { deserialize } from '$app/forms';
import type { ActionResult } from '@sveltejs/kit';

/**
 * Posts a form to its SvelteKit action with XMLHttpRequest, because fetch cannot report upload
 * progress. The answer is the same ActionResult that `use:enhance` would get.
 */
export function postFormWithProgress(
	form: HTMLFormElement,
	submitter: HTMLElement | null,
	onProgress: (fraction: number) => void
): Promise<ActionResult> {
	return new Promise((resolve, reject) => {
		const xhr = new XMLHttpRequest();
		const action =
			submitter instanceof HTMLButtonElement && submitter.hasAttribute('formaction')
				? submitter.formAction
				: form.action;
		xhr.open('POST', action);
		xhr.setRequestHeader('accept', 'application/json');
		xhr.setRequestHeader('x-sveltekit-action', 'true');
		xhr.upload.onprogress = (e) => {
			if (e.lengthComputable) onProgress(e.loaded / e.total);
		};
		xhr.onload = () => {
			try {
				resolve(deserialize(xhr.responseText));
			} catch {
				reject(new Error('The server sent an answer we could not read. Please try again.'));
			}
		};
		xhr.onerror = () =>
			reject(new Error('The upload was interrupted. Check your connection and try again.'));
		xhr.send(new FormData(form, submitter));
	});
}

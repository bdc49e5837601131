import { superValidate, withFiles } from 'sveltekit-superforms';

/**
 * `superValidate` for a posted request, the way every action reads its form. A file posted where
 * the schema wants text stays in a refused form's data, and SvelteKit cannot send a File back to
 * the page (a 500, found twice by the fuzz suite: working hours, then quotes). A refused form has
 * its files taken out here, once for every action; a valid form is returned as it is.
 */
export const readForm = (async (...args: Parameters<typeof superValidate>) => {
	const form = await superValidate(...args);
	if (!form.valid) withFiles(form.data);
	return form;
}) as typeof superValidate;

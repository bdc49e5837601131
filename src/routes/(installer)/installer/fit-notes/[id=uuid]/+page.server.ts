import { error, fail } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { fitNoteMarkSchema } from '$lib/forms/fit-note';
import { discardUpload, storeUpload } from '$lib/server/files/uploads';
import { addFitNotePhoto, getFitNote, markFitNote } from '$lib/server/fit-notes/fit-notes';
import { readFormData, UNREADABLE_FORM_MESSAGE } from '$lib/server/http/form-data';
import { requireRole } from '$lib/server/http/guards';
import { redirectWithNotice } from '$lib/server/http/notice';
import { orError, refusalFail, refusalMessage } from '$lib/server/http/respond';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async ({ params }) => {
	const installer = requireRole('installer');
	const found = orError(await getFitNote(installer.id, params.id));
	return {
		...found,
		note: { ...found.note, createdAt: found.note.createdAt.toISOString() },
		marks: found.marks.map((m) => ({ ...m, createdAt: m.createdAt.toISOString() })),
		markForm: await superValidate(zod4(fitNoteMarkSchema))
	};
};

export const actions = {
	mark: async ({ request, params, cookies }) => {
		const installer = requireRole('installer');
		const markForm = await readForm(request, zod4(fitNoteMarkSchema));
		if (!markForm.valid) return fail(400, { markForm });
		const marked = await markFitNote(installer.id, params.id, markForm.data);
		if (!marked.ok) return refusalMessage(markForm, marked);
		redirectWithNotice(
			cookies,
			`/installer/fit-notes/${params.id}`,
			'Thank you: your mark is on the note.'
		);
	},
	photo: async ({ request, params }) => {
		const installer = requireRole('installer');
		const data = await readFormData(request);
		if (!data) return fail(400, { problem: UNREADABLE_FORM_MESSAGE });
		const outcome = await storeUpload(data.get('photo'), `fit-note-photos/${params.id}`);
		if (!outcome.ok) return fail(400, { problem: outcome.problem });
		const { objectKey, thumbKey, width, height, bytes } = outcome.stored;
		let added;
		try {
			added = await addFitNotePhoto(installer.id, params.id, {
				objectKey,
				thumbKey: thumbKey!,
				width: width!,
				height: height!,
				bytes
			});
		} catch (err) {
			await discardUpload(outcome.stored);
			throw err;
		}
		if (!added.ok) {
			await discardUpload(outcome.stored);
			if (added.status === 404) error(404, added.message);
			return refusalFail(added);
		}
		return { saved: true };
	}
} satisfies Actions;

import { fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { fitNoteSchema, NOTE_FUSE_FAMILIES } from '$lib/forms/fit-note';
import { getPublishContext, publishFitNote } from '$lib/server/fit-notes/fit-notes';
import { requireRole } from '$lib/server/http/guards';
import { redirectWithNotice } from '$lib/server/http/notice';
import { orError, refusalMessage } from '$lib/server/http/respond';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

// The route's id is the booking's: a note is published from a fit the installer reported.
export const load: PageServerLoad = async ({ params }) => {
	const installer = requireRole('installer');
	const context = orError(await getPublishContext(installer.id, params.id));
	if (context.noteId) redirect(303, `/installer/fit-notes/${context.noteId}`);
	const car = context.request;
	const year = Number(car?.year);
	const fuse = (NOTE_FUSE_FAMILIES as readonly string[]).includes(car?.fuseFamily ?? '')
		? car?.fuseFamily
		: undefined;
	const form = await superValidate(
		{
			make: car?.make ?? '',
			model: car?.model ?? '',
			...(Number.isInteger(year) ? { yearFrom: year, yearTo: year } : {}),
			bodyStyle: car?.bodyStyle,
			fuseFamily: fuse as (typeof NOTE_FUSE_FAMILIES)[number] | undefined
		},
		zod4(fitNoteSchema),
		{ errors: false }
	);
	return {
		form,
		title: titleOrUntitled(context.title),
		jobId: context.jobId,
		minutesTaken: context.minutesTaken
	};
};

export const actions = {
	default: async ({ request, params, cookies }) => {
		const installer = requireRole('installer');
		const form = await readForm(request, zod4(fitNoteSchema));
		if (!form.valid) return fail(400, { form });
		const published = await publishFitNote(installer.id, params.id, form.data);
		if (!published.ok) return refusalMessage(form, published);
		redirectWithNotice(
			cookies,
			`/installer/fit-notes/${published.noteId}`,
			'Published. Vetted installers now see your note beside matching jobs; you can add photos here.'
		);
	}
} satisfies Actions;

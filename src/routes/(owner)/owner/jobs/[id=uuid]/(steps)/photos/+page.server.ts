import { error, fail, redirect } from '@sveltejs/kit';
import { photoKindSchema, type PhotoKind } from '$lib/forms/job';
import { listJobPhotos, setJobPhoto } from '$lib/server/marketplace/jobs';
import { loadEditableJob } from '../editable-job';
import { readFormData, UNREADABLE_FORM_MESSAGE } from '$lib/server/http/form-data';
import { deleteObject } from '$lib/server/files/storage';
import { discardUpload, storeUpload } from '$lib/server/files/uploads';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const { job } = await loadEditableJob(params.id);
	return { photos: await listJobPhotos(job.id) };
};

const refuse = (kind: string, problem: string, status = 400) => fail(status, { kind, problem });

export const actions = {
	upload: async ({ request, params }) => {
		const { owner, job } = await loadEditableJob(params.id);
		const data = await readFormData(request);
		if (!data) return refuse('', UNREADABLE_FORM_MESSAGE);
		const kind = photoKindSchema.safeParse(data.get('kind'));
		if (!kind.success) return refuse('', 'Say which photo this is.');
		const outcome = await storeUpload(data.get('photo'), `job-photos/${job.id}`);
		if (!outcome.ok) return refuse(kind.data, outcome.problem);
		const { objectKey, thumbKey, width, height, bytes } = outcome.stored;
		let result;
		try {
			result = await setJobPhoto(job.id, owner.id, kind.data as PhotoKind, {
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
		if (!result.ok) {
			await discardUpload(outcome.stored);
			if (result.status === 404) error(404, result.message);
			return refuse(kind.data, result.message, result.status);
		}
		await Promise.allSettled(result.displaced.map((key) => deleteObject(key)));
		return { kind: kind.data, saved: true };
	},
	remove: async ({ request, params }) => {
		const { owner, job } = await loadEditableJob(params.id);
		const kind = photoKindSchema.safeParse((await readFormData(request))?.get('kind'));
		if (!kind.success) return refuse('', 'Say which photo to remove.');
		const result = await setJobPhoto(job.id, owner.id, kind.data);
		if (!result.ok) {
			if (result.status === 404) error(404, result.message);
			return refuse(kind.data, result.message, result.status);
		}
		await Promise.allSettled(result.displaced.map((key) => deleteObject(key)));
		return { kind: kind.data, removed: true };
	},
	next: async ({ params }) => {
		await loadEditableJob(params.id);
		redirect(303, `/owner/jobs/${params.id}/review`);
	}
} satisfies Actions;

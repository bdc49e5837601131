import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { insuranceSchema } from '$lib/forms/vetting';
import { readFormData, UNREADABLE_FORM_MESSAGE } from '$lib/server/http/form-data';
import { requireRole } from '$lib/server/http/guards';
import { discardUpload, storeUpload } from '$lib/server/files/uploads';
import {
	addInstallerDocument,
	listInstallerDocuments,
	removeInstallerDocument
} from '$lib/server/people/documents';
import { getInstallerProfile, saveInsuranceDetails } from '$lib/server/people/installers';
import { DOCUMENT_TYPES, IMAGE_TYPES } from '$lib/uploads';
import { DOCUMENT_KINDS, mayRemoveDocument, stageOf, type DocumentKind } from '$lib/people/vetting';
import { refusalFail, refusalMessage } from '$lib/server/http/respond';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

const removeSchema = z.object({
	id: z.uuid({ error: 'There is no such document among yours.' }),
	confirm: z.literal('yes', { error: 'Tick the box to confirm the removal.' })
});

export const load: PageServerLoad = async () => {
	const installer = requireRole('installer');
	const [p, documents] = await Promise.all([
		getInstallerProfile(installer.id),
		listInstallerDocuments(installer.id)
	]);
	const initial = p?.insurer
		? {
				insurer: p.insurer,
				policyNumber: p.policyNumber ?? '',
				coverDollars: Math.round((p.coverCents ?? 0) / 100),
				expiresOn: p.insuranceExpiresOn ?? ''
			}
		: undefined;
	const form = await superValidate(initial, zod4(insuranceSchema), { errors: false });
	const stage = p ? stageOf(p) : 'draft';
	return {
		form,
		documents: documents.map((d) => ({ ...d, removable: mayRemoveDocument(d.kind, stage) })),
		hasProfile: p !== null
	};
};

export const actions = {
	saveInsurance: async ({ request }) => {
		const installer = requireRole('installer');
		const form = await readForm(request, zod4(insuranceSchema));
		if (!form.valid) return fail(400, { form });
		const { coverDollars, ...rest } = form.data;
		const result = await saveInsuranceDetails(installer.id, {
			...rest,
			coverCents: coverDollars * 100
		});
		if (!result.ok) return refusalMessage(form, result);
		return message(
			form,
			result.paused
				? 'Saved. Quoting is paused until an admin approves the new certificate.'
				: 'Insurance details saved.'
		);
	},
	upload: async ({ request }) => {
		const installer = requireRole('installer');
		const data = await readFormData(request);
		if (!data) return fail(400, { uploadProblem: UNREADABLE_FORM_MESSAGE });
		const kind = String(data.get('kind') ?? '');
		if (!DOCUMENT_KINDS.includes(kind as DocumentKind)) {
			return fail(400, { uploadProblem: 'Choose what kind of document this is.' });
		}
		if (!(await getInstallerProfile(installer.id))) {
			return fail(400, { uploadProblem: 'Save your application details first.' });
		}
		// Gallery photos are public, so they go through the photo path only (re-encoded, no EXIF).
		const accepted = kind === 'gallery' ? IMAGE_TYPES : DOCUMENT_TYPES;
		const outcome = await storeUpload(data.get('file'), `installers/${installer.id}`, accepted);
		if (!outcome.ok) return fail(400, { uploadProblem: outcome.problem });
		try {
			await addInstallerDocument(installer.id, kind as DocumentKind, outcome.stored);
		} catch (err) {
			await discardUpload(outcome.stored);
			throw err;
		}
		return { uploaded: outcome.stored.originalName };
	},
	removeDocument: async ({ request }) => {
		const installer = requireRole('installer');
		const data = await readFormData(request);
		if (!data) return fail(400, { removeProblem: UNREADABLE_FORM_MESSAGE, removeId: null });
		const parsed = removeSchema.safeParse(Object.fromEntries(data));
		const removeId = String(data.get('id') ?? '');
		if (!parsed.success) {
			return fail(400, { removeProblem: parsed.error.issues[0]?.message ?? '', removeId });
		}
		const result = await removeInstallerDocument(installer.id, parsed.data.id);
		if (!result.ok) return refusalFail(result, { removeProblem: result.message, removeId });
		return { removed: result.originalName };
	}
} satisfies Actions;

import { error, fail, type Cookies } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { accountActionSchema } from '$lib/forms/admin';
import {
	forcePasswordReset,
	getUserForAdmin,
	reinstateAccount,
	suspendAccount,
	type AccountAction
} from '$lib/server/people/admin-users';
import { requireRole } from '$lib/server/http/guards';
import { redirectWithNotice } from '$lib/server/http/notice';
import { refusalMessage } from '$lib/server/http/respond';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async ({ params }) => {
	const admin = requireRole('admin');
	const found = await getUserForAdmin(params.id);
	if (!found) error(404, 'There is no such account.');
	const [suspendForm, reinstateForm, resetForm] = [
		await superValidate(zod4(accountActionSchema), { id: 'suspend' }),
		await superValidate(zod4(accountActionSchema), { id: 'reinstate' }),
		await superValidate(zod4(accountActionSchema), { id: 'reset' })
	];
	return { ...found, self: admin.id === params.id, suspendForm, reinstateForm, resetForm };
};

/** One account action: validate the reason, act, and come back to the page with a notice. */
function action(
	id: 'suspend' | 'reinstate' | 'reset',
	run: (adminId: string, targetId: string, reason: string) => Promise<AccountAction>,
	done: string
) {
	return async ({
		request,
		params,
		cookies
	}: {
		request: Request;
		params: { id: string };
		cookies: Cookies;
	}) => {
		const admin = requireRole('admin');
		const form = await readForm(request, zod4(accountActionSchema), { id });
		if (!form.valid) return fail(400, { form });
		const result = await run(admin.id, params.id, form.data.reason);
		if (!result.ok) return refusalMessage(form, result);
		redirectWithNotice(cookies, `/admin/users/${params.id}`, done);
	};
}

export const actions = {
	suspend: action('suspend', suspendAccount, 'Suspended: the account is signed out and told why.'),
	reinstate: action('reinstate', reinstateAccount, 'The suspension is lifted; they were told.'),
	forceReset: action(
		'reset',
		forcePasswordReset,
		'They are signed out everywhere and have a link to choose a new password.'
	)
} satisfies Actions;

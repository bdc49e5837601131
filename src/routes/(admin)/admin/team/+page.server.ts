import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { adminInviteSchema } from '$lib/forms/auth';
import { createAdminAccount, listAdmins } from '$lib/server/people/accounts';
import { requireRole } from '$lib/server/http/guards';
import { refusalMessage } from '$lib/server/http/respond';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async () => {
	requireRole('admin');
	const [admins, form] = await Promise.all([listAdmins(), superValidate(zod4(adminInviteSchema))]);
	return { admins, form };
};

export const actions = {
	createAdmin: async ({ request }) => {
		const admin = requireRole('admin');
		const form = await readForm(request, zod4(adminInviteSchema));
		if (!form.valid) return fail(400, { form });
		const result = await createAdminAccount(admin, form.data);
		if (!result.ok) return refusalMessage(form, result);
		return message(
			form,
			`${result.user.displayName} is an admin now; we e-mailed them a link to set a password.`
		);
	}
} satisfies Actions;

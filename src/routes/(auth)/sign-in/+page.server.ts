import { fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { safeRedirect, signInSchema } from '$lib/forms/auth';
import { signIn } from '$lib/server/people/accounts';
import { startSession } from '$lib/server/auth';
import { homeFor } from '$lib/server/http/guards';
import { refusalMessage } from '$lib/server/http/respond';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async ({ locals, url }) => {
	const redirectTo = safeRedirect(url.searchParams.get('redirectTo'), url.origin, '');
	if (locals.user) redirect(303, redirectTo || homeFor(locals.user.role));
	return {
		form: await superValidate({ redirectTo }, zod4(signInSchema), { errors: false })
	};
};

export const actions = {
	default: async ({ request, cookies, getClientAddress, url }) => {
		const form = await readForm(request, zod4(signInSchema));
		const { password } = form.data;
		form.data.password = '';
		if (!form.valid) return fail(400, { form });

		const result = await signIn(form.data.email, password, getClientAddress());
		if (!result.ok) return refusalMessage(form, result);
		const { account } = result;
		await startSession(cookies, account.id);
		redirect(303, safeRedirect(form.data.redirectTo, url.origin, homeFor(account.role)));
	}
} satisfies Actions;

import { fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { signUpSchema } from '$lib/forms/auth';
import { createAccount } from '$lib/server/people/accounts';
import { homeFor } from '$lib/server/http/guards';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async ({ locals, url }) => {
	if (locals.user) redirect(303, homeFor(locals.user.role));
	const role = url.searchParams.get('as') === 'installer' ? 'installer' : 'owner';
	return { form: await superValidate({ role }, zod4(signUpSchema), { errors: false }) };
};

export const actions = {
	default: async ({ request }) => {
		const form = await readForm(request, zod4(signUpSchema));
		const { password } = form.data;
		form.data.password = ''; // never echo a password back to the page
		if (!form.valid) return fail(400, { form });
		// The same answer whether or not the address was free: the e-mail says which it was, and
		// the link in it confirms the address and signs the new account in.
		await createAccount({ ...form.data, password });
		redirect(303, '/verify-email?sent=1');
	}
} satisfies Actions;

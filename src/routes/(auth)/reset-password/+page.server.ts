import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { resetPasswordSchema } from '$lib/forms/auth';
import { resetPassword } from '$lib/server/people/accounts';
import { redirectWithNotice } from '$lib/server/http/notice';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async ({ url }) => {
	const token = url.searchParams.get('token') ?? '';
	return {
		form: await superValidate({ token }, zod4(resetPasswordSchema), { errors: false }),
		hasToken: token.length > 0
	};
};

export const actions = {
	default: async ({ request, cookies }) => {
		const form = await readForm(request, zod4(resetPasswordSchema));
		const { password } = form.data;
		form.data.password = '';
		form.data.confirmPassword = '';
		if (!form.valid) return fail(400, { form });
		if (!(await resetPassword(form.data.token, password))) {
			return message(
				form,
				'This reset link has expired or was already used. Ask for a new one below.',
				{ status: 400 }
			);
		}
		redirectWithNotice(cookies, '/sign-in', 'Your password is changed. Sign in with the new one.');
	}
} satisfies Actions;

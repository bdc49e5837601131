import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { forgotPasswordSchema } from '$lib/forms/auth';
import { requestPasswordReset } from '$lib/server/people/accounts';
import { refusalMessage } from '$lib/server/http/respond';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async () => ({
	form: await superValidate(zod4(forgotPasswordSchema))
});

export const actions = {
	default: async ({ request, getClientAddress }) => {
		const form = await readForm(request, zod4(forgotPasswordSchema));
		if (!form.valid) return fail(400, { form });
		const requested = await requestPasswordReset(form.data.email, getClientAddress());
		if (!requested.ok) return refusalMessage(form, requested);
		// The same words whether or not the address has an account.
		return message(
			form,
			'If an account uses that address, a reset link is on its way. It works for one hour.'
		);
	}
} satisfies Actions;

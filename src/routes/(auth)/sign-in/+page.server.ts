import { fail, redirect } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { safeRedirect, signInSchema } from '$lib/forms/auth';
import { authenticate } from '$lib/server/accounts';
import { startSession } from '$lib/server/auth';
import { homeFor } from '$lib/server/http/guards';
import {
	checkSignInAllowed,
	recordFailedSignIn,
	recordSuccessfulSignIn
} from '$lib/server/rate-limit';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const redirectTo = safeRedirect(url.searchParams.get('redirectTo'), url.origin, '');
	if (locals.user) redirect(303, redirectTo || homeFor(locals.user.role));
	return {
		form: await superValidate({ redirectTo }, zod4(signInSchema), { errors: false })
	};
};

export const actions = {
	default: async ({ request, cookies, getClientAddress, url }) => {
		const form = await superValidate(request, zod4(signInSchema));
		const { password } = form.data;
		form.data.password = '';
		if (!form.valid) return fail(400, { form });

		const address = getClientAddress();
		const gate = await checkSignInAllowed(form.data.email, address);
		if (!gate.allowed) {
			const minutes = Math.ceil(gate.retryAfterSeconds / 60);
			return message(
				form,
				`Too many sign-in attempts. Wait ${minutes} minute${minutes === 1 ? '' : 's'} and try again, or reset your password.`,
				{ status: 429 }
			);
		}

		const account = await authenticate(form.data.email, password);
		if (!account) {
			await recordFailedSignIn(form.data.email, address);
			return message(form, 'That e-mail and password do not match an account.', { status: 400 });
		}
		await recordSuccessfulSignIn(form.data.email);
		await startSession(cookies, account.id);
		redirect(303, safeRedirect(form.data.redirectTo, url.origin, homeFor(account.role)));
	}
} satisfies Actions;

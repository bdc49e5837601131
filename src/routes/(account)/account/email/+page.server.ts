import { fail } from '@sveltejs/kit';
import { confirmEmailChangeSchema } from '$lib/forms/account';
import { confirmEmailChange } from '$lib/server/people/account-settings';
import { readFormData } from '$lib/server/http/form-data';
import { redirectWithNotice } from '$lib/server/http/notice';
import type { Actions, PageServerLoad } from './$types';

// Following the link only shows a button; the address changes on the POST, so mail scanners that
// open links change nothing. The link itself proves the new mailbox; no sign-in is needed.
export const load: PageServerLoad = ({ url }) => ({ token: url.searchParams.get('token') });

export const actions = {
	confirm: async ({ request, cookies, locals }) => {
		const parsed = confirmEmailChangeSchema.safeParse(
			Object.fromEntries((await readFormData(request)) ?? [])
		);
		if (!parsed.success)
			return fail(400, { problem: 'This page needs the link from your e-mail.' });
		const result = await confirmEmailChange(parsed.data.token);
		if (!result.ok) return fail(result.status, { problem: result.message });
		const signedInHere = locals.user?.id === result.userId;
		redirectWithNotice(
			cookies,
			signedInHere ? '/account' : '/sign-in',
			signedInHere
				? 'Your e-mail address is changed.'
				: 'Your e-mail address is changed. Sign in with the new one.'
		);
	}
} satisfies Actions;

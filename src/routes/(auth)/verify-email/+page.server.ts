import { fail, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { textField } from '$lib/forms/fields';
import { resendVerification, verifyEmailToken } from '$lib/server/people/accounts';
import { startSession } from '$lib/server/auth';
import { readFormData } from '$lib/server/http/form-data';
import type { Actions, PageServerLoad } from './$types';

const confirmSchema = z.object({ token: textField().min(10).max(200) });

// Following the link only shows a button; the address is confirmed by a POST, so mail scanners
// that open links do not confirm addresses on the owner's behalf.
export const load: PageServerLoad = ({ url, locals }) => ({
	token: url.searchParams.get('token'),
	sent: url.searchParams.has('sent'),
	needed: url.searchParams.has('needed'),
	verified: url.searchParams.has('done') || (locals.user?.emailVerified ?? false),
	email: locals.user?.email ?? null,
	// After confirming, the person continues to where their work starts.
	home: locals.user ? HOME[locals.user.role] : HOME.guest
});

const HOME = {
	owner: { href: '/owner', label: 'Continue to My jobs' },
	installer: { href: '/installer', label: 'Continue to your application' },
	admin: { href: '/admin', label: 'Continue to the overview' },
	guest: { href: '/sign-in', label: 'Sign in to continue' }
} as const;

export const actions = {
	confirm: async ({ request, cookies, locals }) => {
		const parsed = confirmSchema.safeParse(Object.fromEntries((await readFormData(request)) ?? []));
		const userId = parsed.success ? await verifyEmailToken(parsed.data.token) : null;
		if (!userId) {
			return fail(400, {
				error: 'This link has expired or was already used. Sign in and ask for a new one.'
			});
		}
		// The link proves the mailbox; sign-up starts no session, so this is where one begins.
		if (locals.user?.id !== userId) await startSession(cookies, userId);
		redirect(303, '/verify-email?done=1');
	},
	resend: async ({ locals }) => {
		if (!locals.user) redirect(303, '/sign-in?redirectTo=/verify-email');
		await resendVerification(locals.user.id);
		return { resent: true };
	}
} satisfies Actions;

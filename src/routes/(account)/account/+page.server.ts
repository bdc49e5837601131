import { fail } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import {
	closeAccountSchema,
	displayNameSchema,
	emailChangeSchema,
	endSessionSchema,
	passwordChangeSchema
} from '$lib/forms/account';
import { closeAccount, previewAccountClosing } from '$lib/server/people/account-closing';
import {
	changeDisplayName,
	changePassword,
	endAllOtherSessions,
	endOtherSession,
	getAccountSettings,
	requestEmailChange
} from '$lib/server/people/account-settings';
import { clearSessionCookie } from '$lib/server/auth';
import { readFormData } from '$lib/server/http/form-data';
import { requireSession } from '$lib/server/http/guards';
import { redirectWithNotice } from '$lib/server/http/notice';
import { refusalFail, refusalMessage } from '$lib/server/http/respond';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

export const load: PageServerLoad = async () => {
	const { user, session } = requireSession();
	const settings = await getAccountSettings(user.id, session.id);
	const closing = await previewAccountClosing(user.id, user.role);
	return {
		settings: settings!,
		closing,
		nameForm: await superValidate({ displayName: user.displayName }, zod4(displayNameSchema), {
			id: 'name',
			errors: false
		}),
		emailForm: await superValidate(zod4(emailChangeSchema), { id: 'email' }),
		passwordForm: await superValidate(zod4(passwordChangeSchema), { id: 'password' }),
		closeForm: await superValidate(zod4(closeAccountSchema), { id: 'close' })
	};
};

export const actions = {
	changeName: async ({ request, cookies }) => {
		const { user } = requireSession();
		const form = await readForm(request, zod4(displayNameSchema), { id: 'name' });
		if (!form.valid) return fail(400, { form });
		const result = await changeDisplayName(user.id, form.data.displayName);
		if (!result.ok) return refusalMessage(form, result);
		redirectWithNotice(cookies, '/account', `Your name is now ${form.data.displayName}.`);
	},
	changeEmail: async ({ request, cookies }) => {
		const { user } = requireSession();
		const form = await readForm(request, zod4(emailChangeSchema), { id: 'email' });
		const { passwordForEmail } = form.data;
		form.data.passwordForEmail = '';
		if (!form.valid) return fail(400, { form });
		const result = await requestEmailChange(user.id, { ...form.data, passwordForEmail });
		if (!result.ok) return refusalMessage(form, result);
		redirectWithNotice(
			cookies,
			'/account',
			`We sent a link to ${result.sentTo}. Your address changes when you open it; until then it stays ${user.email}.`
		);
	},
	changePassword: async ({ request, cookies }) => {
		const { user, session } = requireSession();
		const form = await readForm(request, zod4(passwordChangeSchema), { id: 'password' });
		const typed = { ...form.data };
		form.data = { currentPassword: '', newPassword: '', confirmPassword: '' };
		if (!form.valid) return fail(400, { form });
		const result = await changePassword(user.id, session.id, typed);
		if (!result.ok) return refusalMessage(form, result);
		const others = result.endedSessions;
		redirectWithNotice(
			cookies,
			'/account',
			others === 0
				? 'Your password is changed.'
				: `Your password is changed, and ${others} other device${others === 1 ? ' is' : 's are'} signed out.`
		);
	},
	endSession: async ({ request, cookies }) => {
		const { user, session } = requireSession();
		const parsed = endSessionSchema.safeParse(
			Object.fromEntries((await readFormData(request)) ?? [])
		);
		if (!parsed.success) return fail(400, { problem: 'That session cannot be found.' });
		const result = await endOtherSession(user.id, parsed.data.session, session.id);
		if (!result.ok) return refusalFail(result);
		redirectWithNotice(cookies, '/account', 'That device is signed out.');
	},
	endOtherSessions: async ({ cookies }) => {
		const { user, session } = requireSession();
		const ended = await endAllOtherSessions(user.id, session.id);
		redirectWithNotice(
			cookies,
			'/account',
			ended === 0
				? 'No other device was signed in.'
				: `${ended} other device${ended === 1 ? ' is' : 's are'} signed out.`
		);
	},
	closeAccount: async ({ request, cookies }) => {
		const { user } = requireSession();
		const form = await readForm(request, zod4(closeAccountSchema), { id: 'close' });
		const { passwordToClose, confirm } = form.data;
		form.data.passwordToClose = '';
		if (!form.valid) return fail(400, { form });
		const result = await closeAccount(user.id, { passwordToClose, confirmed: confirm });
		if (!result.ok) return refusalMessage(form, result);
		clearSessionCookie(cookies);
		redirectWithNotice(cookies, '/', 'Your account is closed and every device is signed out.');
	}
} satisfies Actions;

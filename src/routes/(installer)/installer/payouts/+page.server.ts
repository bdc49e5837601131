import { error, fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/http/guards';
import { redirectWithNotice } from '$lib/server/http/notice';
import { refusalFail } from '$lib/server/http/respond';
import {
	getPayoutSetup,
	refreshPayoutStatus,
	startPayoutOnboarding
} from '$lib/server/money/payouts';
import { listInstallerPayouts } from '$lib/server/money/receipts';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ url }) => {
	const installer = requireRole('installer');
	const [setup, payouts] = await Promise.all([
		getPayoutSetup(installer.id),
		listInstallerPayouts(installer.id)
	]);
	return {
		hasProfile: setup !== null,
		started: Boolean(setup?.payoutAccountId),
		payoutsEnabled: setup?.payoutsEnabled ?? false,
		returned: url.searchParams.has('returned'),
		expired: url.searchParams.has('expired'),
		payouts: payouts.map((p) => ({
			...p,
			slotStart: p.slotStart.toISOString(),
			paidAt: p.paidAt?.toISOString() ?? null,
			releasedAt: p.releasedAt?.toISOString() ?? null
		}))
	};
};

export const actions = {
	setUp: async () => {
		const installer = requireRole('installer');
		const started = await startPayoutOnboarding(installer.id);
		if (!started.ok) return refusalFail(started);
		redirect(303, started.url);
	},
	checkAgain: async ({ cookies }) => {
		const installer = requireRole('installer');
		const result = await refreshPayoutStatus(installer.id);
		if (!result.ok) {
			if (result.status === 404) error(404, result.message);
			return fail(result.status, { problem: result.message });
		}
		redirectWithNotice(
			cookies,
			'/installer/payouts',
			result.payoutsEnabled
				? 'Payouts are set up: you can quote.'
				: 'Payouts are not enabled yet: finish the set-up on the provider’s page.'
		);
	}
} satisfies Actions;

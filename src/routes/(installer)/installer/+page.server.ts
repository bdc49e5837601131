import { requireConfirmedRole, requireRole } from '$lib/server/http/guards';
import { getApplicationStatus, submitApplication } from '$lib/server/installers';
import { listNotices } from '$lib/server/notices';
import { refusalFail } from '$lib/server/http/respond';
import { redirectWithNotice } from '$lib/server/http/notice';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const installer = requireRole('installer');
	const [status, notices] = await Promise.all([
		getApplicationStatus(installer.id),
		listNotices(installer.id)
	]);
	const p = status.profile;
	return {
		displayName: installer.displayName,
		installerId: installer.id,
		stage: status.stage,
		missing: status.missing,
		lastMessage: status.lastMessage,
		notices: notices.map((n) => ({ ...n, createdAt: n.createdAt.toISOString() })),
		payoutsEnabled: p?.payoutsEnabled ?? false,
		profile: p && {
			businessName: p.businessName,
			suburb: p.suburb,
			serviceRadiusKm: p.serviceRadiusKm,
			pausedReason: p.pausedReason,
			insuranceExpiresOn: p.insuranceExpiresOn
		}
	};
};

export const actions = {
	submit: async ({ cookies }) => {
		const installer = requireConfirmedRole('installer');
		const result = await submitApplication(installer.id);
		if (!result.ok) return refusalFail(result);
		redirectWithNotice(
			cookies,
			'/installer',
			'Sent. We e-mailed you a receipt; an admin will look at it soon.'
		);
	}
} satisfies Actions;

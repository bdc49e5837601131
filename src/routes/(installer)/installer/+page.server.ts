import { requireConfirmedRole, requireRole } from '$lib/server/http/guards';
import { getApplicationStatus, submitApplication } from '$lib/server/people/installers';
import { listNotices } from '$lib/server/notices';
import { getInstallerDay } from '$lib/server/work/installer-day';
import { formatDay } from '$lib/time';
import { fitRow, threadRow, waitingQuoteRow } from '$lib/work/day-rows';
import { refusalFail } from '$lib/server/http/respond';
import { redirectWithNotice } from '$lib/server/http/notice';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const installer = requireRole('installer');
	const now = new Date();
	const [status, day, notices] = await Promise.all([
		getApplicationStatus(installer.id),
		getInstallerDay(installer.id, now),
		listNotices(installer.id)
	]);
	const p = status.profile;
	const zone = day.fits.timeZone;
	return {
		today: formatDay(now, zone, now),
		day: {
			fits: { rows: day.fits.rows.map((f) => fitRow(f, zone, now)), more: day.fits.more },
			quotes: {
				rows: day.quotes.rows.map((q) => waitingQuoteRow(q, zone, now)),
				more: day.quotes.more
			},
			threads: {
				rows: day.threads.rows.map((t) => threadRow(t, zone, now)),
				more: day.threads.more
			},
			newJobs: {
				...day.newJobs,
				rows: day.newJobs.rows.map((j) => ({
					id: j.id,
					title: j.title,
					suburb: j.suburb,
					distance: `${j.distanceKm.toFixed(1)} km`,
					posted: formatDay(new Date(j.postedAt), zone, now)
				}))
			}
		},
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

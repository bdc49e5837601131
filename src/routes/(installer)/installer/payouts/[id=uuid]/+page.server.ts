import { error } from '@sveltejs/kit';
import { env } from '$env/dynamic/private';
import { quoteGstNote } from '$lib/money/gst';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { formatSlotLabel } from '$lib/work/schedule';
import { requireRole } from '$lib/server/http/guards';
import { getPayoutStatement } from '$lib/server/money/receipts';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const installer = requireRole('installer');
	const s = await getPayoutStatement(params.id, installer.id);
	if (!s) error(404, 'There is no paid booking of yours here.');
	const b = s.booking;
	return {
		bookingId: b.id,
		title: titleOrUntitled(s.title),
		businessName: s.businessName,
		abn: s.abn,
		slot: formatSlotLabel(
			{ start: b.slotStart.toISOString(), end: b.slotEnd.toISOString() },
			s.timeZone
		),
		timeZone: s.timeZone,
		totalCents: b.totalCents,
		// The installer's own GST line follows their registration when they quoted.
		installerGstNote: quoteGstNote({ gstRegistered: s.gstRegistered, gstCents: s.gstCents }),
		released: s.released,
		releasedAt: s.payment?.releasedAt?.toISOString() ?? null,
		transferId: s.payment?.transferId ?? null,
		split: s.split,
		heldCents: s.heldCents,
		taplineAbn: env.TAPLINE_ABN ?? null
	};
};

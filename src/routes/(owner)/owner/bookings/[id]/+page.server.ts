import { error, fail, redirect } from '@sveltejs/kit';
import { quoteGstNote } from '$lib/gst';
import { getOwnerBooking, lapseExpiredHolds } from '$lib/server/bookings';
import { requireRole } from '$lib/server/guards';
import { startHeldFundsPayment } from '$lib/server/payments';
import { requestEmailDelivery } from '$lib/server/queue';
import { formatSlot } from '$lib/server/quotes';
import type { Actions, PageServerLoad } from './$types';

const NOT_FOUND = 'There is no such booking among yours.';

export const load: PageServerLoad = async ({ params }) => {
	const owner = requireRole('owner');
	const found = await getOwnerBooking(params.id, owner.id);
	if (!found) error(404, NOT_FOUND);
	// An ended hold is lapsed on sight rather than shown as still held.
	await requestEmailDelivery(await lapseExpiredHolds({ jobId: found.jobId }));
	const row = (await getOwnerBooking(params.id, owner.id)) ?? found;
	const b = row.booking;
	return {
		booking: {
			id: b.id,
			status: b.status,
			totalCents: b.totalCents,
			gstNote: quoteGstNote({ gstRegistered: row.gstRegistered, gstCents: row.gstCents }),
			slot: formatSlot(
				{ start: b.slotStart.toISOString(), end: b.slotEnd.toISOString() },
				row.timeZone
			),
			holdExpiresAt: b.holdExpiresAt.toISOString()
		},
		jobId: row.jobId,
		title: row.title ?? 'Your job',
		businessName: row.businessName,
		suburb: row.suburb,
		timeZone: row.timeZone
	};
};

export const actions = {
	pay: async ({ params }) => {
		const owner = requireRole('owner');
		const found = await getOwnerBooking(params.id, owner.id);
		if (!found) error(404, NOT_FOUND);
		if (found.booking.status !== 'awaiting_payment') {
			return fail(409, { problem: 'This booking is not waiting for payment.' });
		}
		const started = await startHeldFundsPayment(found.booking.id);
		if (started.status === 'redirect') redirect(303, started.url);
		return fail(503, { problem: started.message });
	}
} satisfies Actions;

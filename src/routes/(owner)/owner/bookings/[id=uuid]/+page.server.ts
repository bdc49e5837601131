import { error, fail, redirect } from '@sveltejs/kit';
import { quoteGstNote } from '$lib/gst';
import { bookingStatusAt } from '$lib/holds';
import { getOwnerBooking } from '$lib/server/bookings';
import { requireRole } from '$lib/server/http/guards';
import { startHeldFundsPayment } from '$lib/server/payments';
import { formatSlotLabel } from '$lib/schedule';
import type { Actions, PageServerLoad } from './$types';
import { titleOrUntitled } from '$lib/posted-job';

const NOT_FOUND = 'There is no such booking among yours.';

export const load: PageServerLoad = async ({ params }) => {
	const owner = requireRole('owner');
	const row = await getOwnerBooking(params.id, owner.id);
	if (!row) error(404, NOT_FOUND);
	const b = row.booking;
	return {
		booking: {
			id: b.id,
			// A hold that ran out reads as lapsed now; the schedule records it within a minute.
			status: bookingStatusAt(b, new Date()),
			totalCents: b.totalCents,
			gstNote: quoteGstNote({ gstRegistered: row.gstRegistered, gstCents: row.gstCents }),
			slot: formatSlotLabel(
				{ start: b.slotStart.toISOString(), end: b.slotEnd.toISOString() },
				row.timeZone
			),
			holdExpiresAt: b.holdExpiresAt.toISOString()
		},
		jobId: row.jobId,
		title: titleOrUntitled(row.title),
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
		if (bookingStatusAt(found.booking, new Date()) !== 'awaiting_payment') {
			return fail(409, { problem: 'This booking is not waiting for payment.' });
		}
		const started = await startHeldFundsPayment(found.booking.id);
		if (started.status === 'redirect') redirect(303, started.url);
		return fail(503, { problem: started.message });
	}
} satisfies Actions;

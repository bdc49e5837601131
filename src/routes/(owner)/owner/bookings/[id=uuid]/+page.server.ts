import { error, fail, redirect } from '@sveltejs/kit';
import { cancellationSettlement } from '$lib/money/cancellation';
import { quoteGstNote } from '$lib/money/gst';
import { bookingStatusAt } from '$lib/marketplace/holds';
import { getOwnerBooking } from '$lib/server/marketplace/bookings';
import { requireRole } from '$lib/server/http/guards';
import { redirectWithNotice } from '$lib/server/http/notice';
import { refusalFail } from '$lib/server/http/respond';
import { cancelPaidBooking, startHeldFundsPayment } from '$lib/server/money/payments';
import { getPaymentState } from '$lib/server/money/receipts';
import { getBookingTimes } from '$lib/server/work/rescheduling';
import { getReviewPanel } from '$lib/server/work/reviews';
import { lateFeeCents } from '$lib/server/money/stripe';
import { formatSlotLabel } from '$lib/work/schedule';
import type { Actions, PageServerLoad } from './$types';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { stageWords } from '$lib/work/lifecycle';
import { confirmWork } from '$lib/server/work/completion';
import { formatAud } from '$lib/money/money';
import { formatDayTime } from '$lib/time';

const NOT_FOUND = 'There is no such booking among yours.';

export const load: PageServerLoad = async ({ params, url }) => {
	const owner = requireRole('owner');
	const row = await getOwnerBooking(params.id, owner.id);
	if (!row) error(404, NOT_FOUND);
	const b = row.booking;
	const [money, times] = await Promise.all([
		getPaymentState(b.id),
		getBookingTimes(b.id, { id: owner.id, side: 'owner' })
	]);
	const now = new Date();
	const status =
		money.paidAt && b.status === 'awaiting_payment' ? b.status : bookingStatusAt(b, now);
	// What cancelling now would do, by the same rule the cancellation applies.
	const cancelPreview =
		status === 'confirmed' && money.heldCents > 0 && !money.releasedAt
			? cancellationSettlement({
					cancelledBy: 'owner',
					at: now,
					slotStart: b.slotStart,
					heldCents: money.heldCents,
					lateFeeCents: lateFeeCents()
				})
			: null;
	return {
		booking: {
			id: b.id,
			// A hold that ran out reads as lapsed now; the schedule records it within a minute.
			status,
			totalCents: b.totalCents,
			gstNote: quoteGstNote({ gstRegistered: row.gstRegistered, gstCents: row.gstCents }),
			slot: formatSlotLabel(
				{ start: b.slotStart.toISOString(), end: b.slotEnd.toISOString() },
				row.timeZone
			),
			holdExpiresAt: b.holdExpiresAt.toISOString(),
			stage: b.stage
		},
		payment: {
			paid: money.paidAt !== null,
			lastProblem: money.lastProblem,
			refundedAfterLapse: money.refundedAfterLapseAt !== null,
			heldCents: money.heldCents,
			released: money.releasedAt !== null,
			// Back from the hosted checkout before the provider's event has arrived.
			confirming: url.searchParams.has('paid') && b.status === 'awaiting_payment'
		},
		cancelPreview: b.stage === 'to_fit' ? cancelPreview : null,
		fit: {
			stage: b.stage,
			words: stageWords(b.stage),
			reported: b.reportedAt !== null,
			confirmBy: b.confirmBy ? formatDayTime(b.confirmBy, row.timeZone, now) : null,
			mayAnswer: b.stage === 'reported' && b.confirmBy !== null && now < b.confirmBy
		},
		proposal: times?.open
			? {
					mine: times.open.mine,
					slot: formatSlotLabel(
						{ start: times.open.slotStart, end: times.open.slotEnd },
						row.timeZone
					)
				}
			: null,
		reviews: await getReviewPanel(b.id, owner.id, 'owner', now),
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
		if ('ok' in started) return refusalFail(started);
		if (started.status === 'redirect') redirect(303, started.url);
		return fail(503, { problem: started.message });
	},
	cancel: async ({ params, cookies }) => {
		const owner = requireRole('owner');
		const result = await cancelPaidBooking(params.id, 'owner', owner.id);
		if (!result.ok) return refusalFail(result);
		redirectWithNotice(cookies, `/owner/bookings/${params.id}`, `Cancelled. ${result.rule}`);
	},
	confirm: async ({ params, cookies }) => {
		const owner = requireRole('owner');
		const result = await confirmWork(params.id, owner.id);
		if (!result.ok) return refusalFail(result);
		const release = result.release;
		redirectWithNotice(
			cookies,
			`/owner/bookings/${params.id}`,
			release.ok
				? `Thank you: the work is confirmed and ${formatAud(release.payoutCents)} has been released to the installer.`
				: 'Thank you: the work is confirmed. Releasing the held funds is taking longer than usual; we retry automatically and the installer is paid as soon as it goes through.'
		);
	}
} satisfies Actions;

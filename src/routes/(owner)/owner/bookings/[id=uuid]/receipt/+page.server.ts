import { error } from '@sveltejs/kit';
import { quoteGstNote } from '$lib/money/gst';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { formatSlotLabel } from '$lib/work/schedule';
import { requireRole } from '$lib/server/http/guards';
import { getOwnerReceipt } from '$lib/server/money/receipts';
import type { PageServerLoad } from './$types';

/** Each ledger line with what the booking held after it. */
function runningHeld(lines: { kind: string; at: Date; heldChangeCents: number }[]) {
	let held = 0;
	return lines.map((l) => {
		held += l.heldChangeCents;
		return { kind: l.kind, at: l.at.toISOString(), heldAfterCents: held };
	});
}

export const load: PageServerLoad = async ({ params }) => {
	const owner = requireRole('owner');
	const r = await getOwnerReceipt(params.id, owner.id);
	if (!r?.payment?.paidAt) error(404, 'There is no paid booking of yours here.');
	const b = r.booking;
	return {
		bookingId: b.id,
		title: titleOrUntitled(r.title),
		ownerName: r.ownerName,
		businessName: r.businessName,
		abn: r.abn,
		slot: formatSlotLabel(
			{ start: b.slotStart.toISOString(), end: b.slotEnd.toISOString() },
			r.timeZone
		),
		totalCents: b.totalCents,
		gstNote: quoteGstNote({ gstRegistered: r.gstRegistered, gstCents: r.gstCents }),
		paidAt: r.payment.paidAt.toISOString(),
		reference: r.payment.paymentIntentId,
		timeZone: r.timeZone,
		heldCents: r.heldCents,
		lines: runningHeld(r.lines)
	};
};

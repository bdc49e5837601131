import { error, fail } from '@sveltejs/kit';
import { adminNoteSchema, dollarsToCents, settleSchema } from '$lib/forms/dispute';
import { DISPUTE_REASON_LABELS, labelOf } from '$lib/labels';
import { formatAud } from '$lib/money/money';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { formatSlotLabel, resolveSlotStart } from '$lib/work/schedule';
import { formatDayTime } from '$lib/time';
import { addAdminNote, getDisputeForAdmin, settleDispute } from '$lib/server/work/disputes';
import { readDisputeForm } from '$lib/server/http/dispute-form';
import { requireRole } from '$lib/server/http/guards';
import { redirectWithNotice } from '$lib/server/http/notice';
import { refusalFail } from '$lib/server/http/respond';
import type { Actions, PageServerLoad } from './$types';

const NOT_FOUND = 'There is no such dispute.';

export const load: PageServerLoad = async ({ params }) => {
	const admin = requireRole('admin');
	const found = await getDisputeForAdmin(params.id);
	if (!found) error(404, NOT_FOUND);
	const { dispute: d, booking: b, timeZone } = found;
	const now = new Date();
	return {
		disputeId: d.id,
		bookingId: b.id,
		status: d.status,
		title: titleOrUntitled(found.title),
		ownerName: found.ownerName,
		businessName: found.businessName,
		reason: labelOf(DISPUTE_REASON_LABELS, d.reason),
		openedAt: formatDayTime(d.openedAt, timeZone, now),
		slot: formatSlotLabel(
			{ start: b.slotStart.toISOString(), end: b.slotEnd.toISOString() },
			timeZone,
			now
		),
		total: formatAud(b.totalCents),
		held: formatAud(found.held),
		heldCents: found.held,
		timeZone,
		party: admin.id === b.ownerId || admin.id === b.installerId,
		settledAt: d.settledAt ? formatDayTime(d.settledAt, timeZone, now) : null,
		timeline: found.timeline
	};
};

export const actions = {
	note: async ({ params, request, cookies }) => {
		const admin = requireRole('admin');
		const read = await readDisputeForm(request, adminNoteSchema, null);
		if (!read.ok) return read.failure;
		const added = await addAdminNote(params.id, admin.id, read.data.body);
		if (!added.ok) return refusalFail(added, { values: read.values });
		redirectWithNotice(cookies, `/admin/disputes/${params.id}`, 'Note added to the timeline.');
	},
	settle: async ({ params, request, cookies }) => {
		const admin = requireRole('admin');
		const read = await readDisputeForm(request, settleSchema, null);
		if (!read.ok) return read.failure;
		const form = read.data;
		let visit: { start: Date; end: Date } | null = null;
		if (form.outcome === 'return_visit') {
			const found = await getDisputeForAdmin(params.id);
			if (!found) error(404, NOT_FOUND);
			const start = resolveSlotStart(form.visitDate, form.visitTime, found.timeZone);
			if (!start.ok) {
				return fail(400, {
					problem: start.problem,
					fields: { visitTime: start.problem },
					values: read.values
				});
			}
			// The return visit takes as long as the booked slot did.
			const length = found.booking.slotEnd.getTime() - found.booking.slotStart.getTime();
			visit = { start: start.start, end: new Date(start.start.getTime() + length) };
		}
		const settled = await settleDispute({
			disputeId: params.id,
			adminId: admin.id,
			outcome: form.outcome,
			refundCents: form.outcome === 'partial_refund' ? dollarsToCents(form.refund) : null,
			visit,
			note: form.note
		});
		if (!settled.ok) {
			return refusalFail(settled, { fields: settled.fields ?? {}, values: read.values });
		}
		redirectWithNotice(
			cookies,
			`/admin/disputes/${params.id}`,
			'Settled. Both sides have been e-mailed the outcome.'
		);
	}
} satisfies Actions;

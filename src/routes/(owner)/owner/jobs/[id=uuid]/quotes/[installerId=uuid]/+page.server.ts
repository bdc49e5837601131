import { error, fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { z } from 'zod';
import { threadMessageSchema } from '$lib/forms/thread';
import { textField } from '$lib/forms/fields';
import { jobStatusShown, quoteStatusShown } from '$lib/marketplace/holds';
import { bookQuote, getLiveBookingForJob, HOLD_MINUTES } from '$lib/server/marketplace/bookings';
import { requireConfirmedRole, requireRole } from '$lib/server/http/guards';
import { getOwnedJob } from '$lib/server/marketplace/jobs';
import { orError, refusalMessage } from '$lib/server/http/respond';
import { formatSlotLabel } from '$lib/work/schedule';
import { getOwnerThread, postJobMessage } from '$lib/server/marketplace/threads';
import { listQuotesForOwner } from '$lib/server/marketplace/quotes';
import { CONTACTS_HIDDEN_NOTE } from '$lib/labels';
import { redirectWithNotice } from '$lib/server/http/notice';
import type { Actions, PageServerLoad } from './$types';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { readForm } from '$lib/server/http/read-form';

const bookSchema = z.object({
	quoteId: z.uuid(),
	slot: textField({ error: 'Choose a time' }).min(1, { error: 'Choose one of the times offered' })
});
const NOT_FOUND = 'There is no such quote on your jobs.';

export const load: PageServerLoad = async ({ params }) => {
	const owner = requireRole('owner');
	const job = await getOwnedJob(params.id, owner.id);
	if (!job) error(404, NOT_FOUND);
	const [quotes, thread, live] = await Promise.all([
		listQuotesForOwner(job.id, owner.id),
		getOwnerThread(job.id, owner.id, params.installerId),
		getLiveBookingForJob(job.id)
	]);
	// Only an installer who quoted (or wrote about the job) has a page here.
	const { messages, businessName } = orError(thread);
	// A hold that ran out reads as over at once (booking it again lapses it for good).
	const jobStatus = jobStatusShown(job.status, live !== null);
	const found = quotes?.find((x) => x.installerId === params.installerId) ?? null;
	const q = found && { ...found, status: quoteStatusShown(found.status, live !== null) };
	const now = Date.now();
	const [bookForm, replyForm] = await Promise.all([
		superValidate({ quoteId: q?.id ?? '', slot: '' }, zod4(bookSchema), { errors: false }),
		superValidate(zod4(threadMessageSchema))
	]);
	return {
		job: {
			id: job.id,
			title: titleOrUntitled(job.title),
			status: jobStatus,
			timeZone: job.timeZone
		},
		quote: q && {
			id: q.id,
			businessName: q.businessName,
			suburb: q.suburb,
			status: q.status,
			onHold: q.onHold,
			revision: q.revision,
			lines: q.lines,
			totalCents: q.totalCents,
			gstCents: q.gstCents,
			gstRegistered: q.gstRegistered,
			warrantyMonths: q.warrantyMonths,
			cameraSupplied: q.cameraSupplied,
			message: q.message,
			distanceKm: q.distanceKm,
			expiresAt: q.expiresAt?.toISOString() ?? null,
			slots: q.slots.map((s) => ({
				value: s.start,
				label: formatSlotLabel(s, job.timeZone),
				past: Date.parse(s.start) <= now
			}))
		},
		bookable:
			jobStatus === 'collecting_quotes' &&
			q?.status === 'live' &&
			!q.onHold &&
			(!q.expiresAt || q.expiresAt.getTime() > now),
		holdMinutes: HOLD_MINUTES,
		businessName,
		messages: messages.map((m) => ({ ...m, mine: m.authorId === owner.id })),
		bookForm,
		replyForm
	};
};

export const actions = {
	book: async ({ request, params }) => {
		const owner = requireConfirmedRole('owner');
		const bookForm = await readForm(request, zod4(bookSchema));
		if (!bookForm.valid) return fail(400, { bookForm });
		const result = await bookQuote(owner.id, params.id, bookForm.data.quoteId, bookForm.data.slot);
		if (!result.ok) return refusalMessage(bookForm, result);
		redirect(303, `/owner/bookings/${result.bookingId}`);
	},
	reply: async ({ request, params, cookies }) => {
		const owner = requireConfirmedRole('owner');
		const replyForm = await readForm(request, zod4(threadMessageSchema));
		if (!replyForm.valid) return fail(400, { replyForm });
		const sent = await postJobMessage(
			params.id,
			params.installerId,
			{ id: owner.id, role: 'owner' },
			replyForm.data.body
		);
		if (!sent.ok) return refusalMessage(replyForm, sent);
		redirectWithNotice(
			cookies,
			`/owner/jobs/${params.id}/quotes/${params.installerId}#questions`,
			sent.masked.length > 0 ? `Sent. ${CONTACTS_HIDDEN_NOTE}` : 'Sent.'
		);
	}
} satisfies Actions;

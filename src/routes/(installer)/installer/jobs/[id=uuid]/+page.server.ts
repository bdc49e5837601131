import { error, fail, redirect } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { threadMessageSchema } from '$lib/forms/thread';
import { requireConfirmedRole, requireRole } from '$lib/server/http/guards';
import { listJobPhotos } from '$lib/server/marketplace/jobs';
import { fitsAwaitingNote, notesForVehicle } from '$lib/server/fit-notes/fit-notes';
import { refusalFail, refusalMessage } from '$lib/server/http/respond';
import { getInstallerContext, getJobForInstaller } from '$lib/server/marketplace/matching';
import { formatSlotLabel } from '$lib/work/schedule';
import { listJobMessages, postJobMessage } from '$lib/server/marketplace/threads';
import { listQuoteRevisions, submitQuote, withdrawQuote } from '$lib/server/marketplace/quotes';
import { getReviewPanel } from '$lib/server/work/reviews';
import { quoteFormSchema, toQuoteInput } from './quote-form';
import { quoteFormDefaults } from './quote-defaults';
import { CONTACTS_HIDDEN_NOTE as HIDDEN_NOTE } from '$lib/labels';
import { redirectWithNotice } from '$lib/server/http/notice';
import { cancelPaidBooking } from '$lib/server/money/payments';
import { feeOf, getMarketSettings } from '$lib/server/money/settings';
import type { Actions, PageServerLoad } from './$types';
import { readForm } from '$lib/server/http/read-form';

const NOT_FOUND = 'There is no such job on your board.';

async function context() {
	const installer = requireRole('installer');
	const ctx = await getInstallerContext(installer.id);
	if (!ctx) error(404, NOT_FOUND);
	return { installer, ctx };
}

export const load: PageServerLoad = async ({ params }) => {
	const { installer, ctx } = await context();
	const found = await getJobForInstaller(params.id, ctx);
	if (!found) error(404, NOT_FOUND);
	const [photos, messages, revisions, defaults, fitNotes, mayPublishNote] = await Promise.all([
		listJobPhotos(found.id),
		listJobMessages(found.id, installer.id),
		found.myQuote ? listQuoteRevisions(found.myQuote.id) : Promise.resolve([]),
		quoteFormDefaults(found, ctx),
		found.request ? notesForVehicle(installer.id, found.request) : Promise.resolve([]),
		found.booking ? fitsAwaitingNote(installer.id, found.booking.id) : Promise.resolve(false)
	]);
	const [form, askForm] = await Promise.all([
		superValidate(defaults, zod4(quoteFormSchema), { errors: false }),
		superValidate(zod4(threadMessageSchema))
	]);
	const q = found.myQuote;
	return {
		job: { ...found, myQuote: null, request: null },
		myQuote: q && {
			status: q.status,
			revision: q.revision,
			lines: q.lines,
			totalCents: q.totalCents,
			gstCents: q.gstCents,
			gstRegistered: q.gstRegistered,
			warrantyMonths: q.warrantyMonths,
			cameraSupplied: q.cameraSupplied,
			message: q.message,
			slots: q.slots.map((s) => formatSlotLabel(s, ctx.timeZone)),
			expiresAt: q.expiresAt?.toISOString() ?? null
		},
		bookingSlot: found.booking
			? formatSlotLabel(
					{
						start: found.booking.slotStart.toISOString(),
						end: found.booking.slotEnd.toISOString()
					},
					ctx.timeZone
				)
			: null,
		revisions: revisions.map((r) => ({
			revision: r.revision,
			createdAt: r.createdAt.toISOString(),
			totalCents: Number(r.snapshot.totalCents)
		})),
		photos,
		fitNotes,
		publishNoteHref:
			mayPublishNote && found.booking ? `/installer/fit-notes/publish/${found.booking.id}` : null,
		messages: messages.map((m) => ({ ...m, mine: m.authorId === installer.id })),
		mayQuote:
			found.status === 'collecting_quotes' &&
			found.problem === null &&
			ctx.canQuote &&
			ctx.payoutsEnabled,
		needsPayouts:
			found.status === 'collecting_quotes' &&
			found.problem === null &&
			ctx.canQuote &&
			!ctx.payoutsEnabled,
		form,
		askForm,
		reviews: found.booking
			? await getReviewPanel(found.booking.id, installer.id, 'installer')
			: null,
		timeZone: ctx.timeZone,
		gstRegistered: ctx.gstRegistered,
		// Tapline's fee as it stands today (market settings), for the fee line under the quote.
		fee: feeOf(await getMarketSettings())
	};
};

export const actions = {
	quote: async ({ request, params, cookies }) => {
		const { installer, ctx } = await context();
		const form = await readForm(request, zod4(quoteFormSchema));
		if (!form.valid) return fail(400, { form });
		let input;
		try {
			input = toQuoteInput(form.data, ctx.timeZone);
		} catch {
			return message(form, 'One of the dates is not a real calendar date.', { status: 400 });
		}
		if ('problems' in input) return message(form, input.problems.join(' '), { status: 400 });
		const result = await submitQuote(installer.id, params.id, input);
		if (!result.ok) {
			return refusalMessage(form, {
				...result,
				message: (result.problems ?? [result.message]).join(' ')
			});
		}
		redirectWithNotice(
			cookies,
			`/installer/jobs/${params.id}`,
			`Quote sent (revision ${String(result.revision)}). The owner gets an e-mail; you can revise it until they book.${result.masked.length > 0 ? ` ${HIDDEN_NOTE}` : ''}`
		);
	},
	cancelBooking: async ({ params, cookies }) => {
		const { installer, ctx } = await context();
		const found = await getJobForInstaller(params.id, ctx);
		if (!found?.booking || found.booking.status !== 'confirmed') error(404, NOT_FOUND);
		const result = await cancelPaidBooking(found.booking.id, 'installer', installer.id);
		if (!result.ok) return refusalFail(result);
		redirectWithNotice(
			cookies,
			'/installer',
			'Booking cancelled: the owner is refunded in full and the job is open to quotes again.'
		);
	},
	withdraw: async ({ params }) => {
		const { installer } = await context();
		const result = await withdrawQuote(installer.id, params.id);
		if (!result.ok) return refusalFail(result);
		redirect(303, `/installer/jobs/${params.id}`);
	},
	ask: async ({ request, params, cookies }) => {
		requireConfirmedRole('installer');
		const { installer } = await context();
		const askForm = await readForm(request, zod4(threadMessageSchema));
		if (!askForm.valid) return fail(400, { askForm });
		const sent = await postJobMessage(
			params.id,
			installer.id,
			{ id: installer.id, role: 'installer' },
			askForm.data.body
		);
		if (!sent.ok) return refusalMessage(askForm, sent);
		redirectWithNotice(
			cookies,
			`/installer/jobs/${params.id}#questions`,
			sent.masked.length > 0 ? `Sent. ${HIDDEN_NOTE}` : 'Sent.'
		);
	}
} satisfies Actions;

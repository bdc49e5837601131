import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import { textField } from '$lib/forms/fields';
import { requireRole } from '$lib/server/http/guards';
import { readFormData } from '$lib/server/http/form-data';
import { redirectWithNotice } from '$lib/server/http/notice';
import { refusalFail } from '$lib/server/http/respond';
import { refundHeldFunds, releaseHeldFunds } from '$lib/server/money/payments';
import { listPaidBookingsForAdmin, reconcileWithProvider } from '$lib/server/money/receipts';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	requireRole('admin');
	const [bookings, reconciliation] = await Promise.all([
		listPaidBookingsForAdmin(),
		reconcileWithProvider().catch(() => null)
	]);
	return {
		reconciliation,
		bookings: bookings.map((b) => ({
			...b,
			paidAt: b.paidAt?.toISOString() ?? null,
			releasedAt: b.releasedAt?.toISOString() ?? null
		}))
	};
};

const bookingField = z.object({
	bookingId: z.uuid({ error: 'Choose a booking.' }),
	// Money moves at once: the form asks for a tick first.
	confirm: z.literal('on', { error: 'Tick "I am sure" first: money moves at once.' }),
	reason: textField({ error: 'Say why, in a few words' })
		.trim()
		.min(5, {
			error: 'Say why, in a few words (at least 5 characters): it is kept in the audit trail.'
		})
		.max(300, { error: 'Keep the reason under 300 characters' })
});
const refundFields = bookingField.extend({
	amount: z
		.string()
		.regex(/^\d+(\.\d{1,2})?$/, 'Enter the refund in dollars and cents, e.g. 25.00')
		.transform((s) => Math.round(Number(s) * 100))
});

export const actions = {
	// Release happens when the job is confirmed done (the lifecycle work calls releaseHeldFunds);
	// until then an admin can release by hand.
	release: async ({ request, cookies }) => {
		const admin = requireRole('admin');
		const data = await readFormData(request);
		const parsed = bookingField.safeParse(data ? Object.fromEntries(data) : {});
		if (!parsed.success) {
			return fail(400, { problem: parsed.error.issues[0]?.message ?? 'Choose a booking.' });
		}
		const result = await releaseHeldFunds(parsed.data.bookingId, new Date(), {
			adminId: admin.id,
			reason: parsed.data.reason
		});
		if (!result.ok) return refusalFail(result);
		redirectWithNotice(
			cookies,
			'/admin/payments',
			result.alreadyReleased ? 'That booking was paid out already.' : 'Released to the installer.'
		);
	},
	refund: async ({ request, cookies }) => {
		const admin = requireRole('admin');
		const data = await readFormData(request);
		const parsed = refundFields.safeParse(data ? Object.fromEntries(data) : {});
		if (!parsed.success) {
			return fail(400, { problem: parsed.error.issues[0]?.message ?? 'Check the refund.' });
		}
		const result = await refundHeldFunds(parsed.data.bookingId, parsed.data.amount, {
			adminId: admin.id,
			reason: parsed.data.reason
		});
		if (!result.ok) return refusalFail(result);
		redirectWithNotice(cookies, '/admin/payments', 'Refunded.');
	}
} satisfies Actions;

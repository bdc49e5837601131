import { requireRole } from '$lib/server/http/guards';
import { listOwnerPayments } from '$lib/server/money/receipts';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async () => {
	const owner = requireRole('owner');
	const rows = await listOwnerPayments(owner.id);
	return {
		payments: rows.map((r) => ({
			...r,
			paidAt: r.paidAt?.toISOString() ?? null,
			refundedAfterLapse: r.refundedAfterLapseAt !== null
		}))
	};
};

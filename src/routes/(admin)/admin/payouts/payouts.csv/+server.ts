import { error } from '@sveltejs/kit';
import { payoutQuerySchema } from '$lib/forms/admin';
import { MAX_EXPORT_ROWS } from '$lib/server/marketplace/admin-bookings';
import { exportPayoutsCsv } from '$lib/server/money/admin-payouts';
import { requireRole } from '$lib/server/http/guards';
import type { RequestHandler } from './$types';

/** The admin's payout list as a CSV file: the same rows as the table, for the whole range. */
export const GET: RequestHandler = async ({ url }) => {
	requireRole('admin');
	const query = payoutQuerySchema.parse(Object.fromEntries(url.searchParams));
	const csv = await exportPayoutsCsv(query);
	if (csv === null) {
		error(
			400,
			`More than ${MAX_EXPORT_ROWS.toLocaleString('en-AU')} payouts match; choose a shorter date range.`
		);
	}
	const name = `tapline-payouts${query.from ? `-from-${query.from}` : ''}${query.to ? `-to-${query.to}` : ''}.csv`;
	return new Response(csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${name}"`,
			'cache-control': 'no-store'
		}
	});
};

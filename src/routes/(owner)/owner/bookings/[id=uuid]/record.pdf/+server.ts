import { error } from '@sveltejs/kit';
import { NOT_YOUR_BOOKING, getInstallRecord } from '$lib/server/fit-reports';
import { requireRole } from '$lib/server/http/guards';
import { installRecordPdf } from '$lib/server/install-record-pdf';
import type { RequestHandler } from './$types';

/** The install record as a PDF, once the fit report is filed. */
export const GET: RequestHandler = async ({ params }) => {
	const viewer = requireRole('owner');
	const record = await getInstallRecord(params.id, viewer);
	if (!record) error(404, NOT_YOUR_BOOKING);
	if (!record.report) error(409, 'The install record fills in once the fit report is filed.');
	const pdf = await installRecordPdf(record);
	return new Response(Buffer.from(pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `attachment; filename="install-record-${record.bookingId}.pdf"`,
			'cache-control': 'private, no-store'
		}
	});
};

import { error } from '@sveltejs/kit';
import { NOT_YOUR_BOOKING, getInstallRecord } from '../work/fit-reports';
import { requireRole } from './guards';
import { installRecordPdf } from '../work/install-record-pdf';

/**
 * The install record of a booking as a PDF download, for its owner or its installer (the route
 * says which): 404 for anyone else's booking, 409 until the fit report is filed.
 */
export async function installRecordPdfResponse(
	bookingId: string,
	role: 'owner' | 'installer'
): Promise<Response> {
	const viewer = requireRole(role);
	const record = await getInstallRecord(bookingId, viewer);
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
}

import { installRecordPdfResponse } from '$lib/server/http/install-record';
import type { RequestHandler } from './$types';

/** The install record as a PDF, once the fit report is filed. */
export const GET: RequestHandler = ({ params }) => installRecordPdfResponse(params.id, 'owner');

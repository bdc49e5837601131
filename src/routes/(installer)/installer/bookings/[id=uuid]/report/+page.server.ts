import { error, fail } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { FIT_FUSE_FAMILIES, fitReportSchemaFor } from '$lib/forms/fit-report';
import {
	NOT_YOUR_BOOKING,
	fileFitReport,
	getReportableBooking
} from '$lib/server/work/fit-reports';
import { requireRole } from '$lib/server/http/guards';
import { redirectWithNotice } from '$lib/server/http/notice';
import { refusalMessage } from '$lib/server/http/respond';
import { formatDayTime } from '$lib/time';
import type { Actions, PageServerLoad } from './$types';

async function reportable(bookingId: string) {
	const installer = requireRole('installer');
	const found = await getReportableBooking(bookingId, installer.id);
	if (!found) error(404, NOT_YOUR_BOOKING);
	return { installer, found };
}

export const load: PageServerLoad = async ({ params }) => {
	const { found } = await reportable(params.id);
	const family = FIT_FUSE_FAMILIES.find((f) => f === found.fuseFamily);
	const form = await superValidate(
		{ fuseFamily: family },
		zod4(fitReportSchemaFor(found.rearCamera)),
		{ errors: false }
	);
	return {
		form,
		booking: {
			id: found.id,
			title: found.title,
			when: formatDayTime(found.slotStart, found.timeZone),
			rearCamera: found.rearCamera,
			power: found.power,
			canReport: found.canReport,
			why: found.why
		}
	};
};

export const actions = {
	file: async ({ request, params, cookies }) => {
		const { installer, found } = await reportable(params.id);
		const formData = await request.formData();
		const form = await superValidate(formData, zod4(fitReportSchemaFor(found.rearCamera)));
		if (!form.valid) return fail(400, { form });
		const filed = await fileFitReport(
			params.id,
			installer.id,
			form.data,
			formData.getAll('photos')
		);
		if (!filed.ok) return refusalMessage(form, filed);
		redirectWithNotice(
			cookies,
			`/installer/bookings/${params.id}/record`,
			'Fit report filed. The owner has been asked to confirm the work; their install record is ready.'
		);
	}
} satisfies Actions;

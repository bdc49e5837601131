import { error } from '@sveltejs/kit';
import { disputeEntrySchema } from '$lib/forms/dispute';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { addDisputeEntry, getDisputeForParty } from '$lib/server/work/disputes';
import { discardPhotos, readDisputeForm } from '$lib/server/http/dispute-form';
import { disputeView } from '$lib/server/http/dispute-view';
import { requireRole } from '$lib/server/http/guards';
import { redirectWithNotice } from '$lib/server/http/notice';
import { refusalFail } from '$lib/server/http/respond';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ params }) => {
	const installer = requireRole('installer');
	const found = await getDisputeForParty(params.id, installer.id, 'installer');
	if (!found) error(404, 'There is no such booking among yours.');
	return {
		bookingId: found.booking.id,
		jobId: found.booking.jobId,
		title: titleOrUntitled(found.title),
		ownerName: found.ownerName,
		...disputeView(found, new Date())
	};
};

export const actions = {
	respond: async ({ params, request, cookies }) => {
		const installer = requireRole('installer');
		const read = await readDisputeForm(request, disputeEntrySchema, `disputes/${params.id}`);
		if (!read.ok) return read.failure;
		const added = await addDisputeEntry({
			bookingId: params.id,
			userId: installer.id,
			side: 'installer',
			body: read.data.body,
			photos: read.photos
		});
		if (!added.ok) {
			await discardPhotos(read.photos);
			return refusalFail(added, { values: read.values });
		}
		redirectWithNotice(
			cookies,
			`/installer/bookings/${params.id}/dispute`,
			'Your response is on the timeline. The owner and Tapline can read it now.'
		);
	}
} satisfies Actions;

import { error } from '@sveltejs/kit';
import { disputeEntrySchema, raiseProblemSchema } from '$lib/forms/dispute';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { addDisputeEntry, getDisputeForParty, openDispute } from '$lib/server/work/disputes';
import { discardPhotos, readDisputeForm } from '$lib/server/http/dispute-form';
import { requireRole } from '$lib/server/http/guards';
import { redirectWithNotice } from '$lib/server/http/notice';
import { refusalFail } from '$lib/server/http/respond';
import { disputeView } from '$lib/server/http/dispute-view';
import type { Actions, PageServerLoad } from './$types';

const NOT_FOUND = 'There is no such booking among yours.';

export const load: PageServerLoad = async ({ params }) => {
	const owner = requireRole('owner');
	const found = await getDisputeForParty(params.id, owner.id, 'owner');
	if (!found) error(404, NOT_FOUND);
	const now = new Date();
	const b = found.booking;
	const windowOpen =
		b.status === 'confirmed' && b.stage === 'reported' && !!b.confirmBy && b.confirmBy > now;
	return {
		bookingId: b.id,
		title: titleOrUntitled(found.title),
		businessName: found.businessName,
		stage: b.stage,
		canRaise: windowOpen,
		...disputeView(found, now)
	};
};

export const actions = {
	raise: async ({ params, request, cookies }) => {
		const owner = requireRole('owner');
		const read = await readDisputeForm(request, raiseProblemSchema, `disputes/${params.id}`);
		if (!read.ok) return read.failure;
		const opened = await openDispute({
			bookingId: params.id,
			ownerId: owner.id,
			reason: read.data.reason,
			description: read.data.description,
			photos: read.photos
		});
		if (!opened.ok) {
			await discardPhotos(read.photos);
			return refusalFail(opened, { values: read.values });
		}
		redirectWithNotice(
			cookies,
			`/owner/bookings/${params.id}/problem`,
			'Problem raised. The held funds stay held while a Tapline admin looks at it; the installer has been asked for their side.'
		);
	},
	addEvidence: async ({ params, request, cookies }) => {
		const owner = requireRole('owner');
		const read = await readDisputeForm(request, disputeEntrySchema, `disputes/${params.id}`);
		if (!read.ok) return read.failure;
		const added = await addDisputeEntry({
			bookingId: params.id,
			userId: owner.id,
			side: 'owner',
			body: read.data.body,
			photos: read.photos
		});
		if (!added.ok) {
			await discardPhotos(read.photos);
			return refusalFail(added, { values: read.values });
		}
		redirectWithNotice(cookies, `/owner/bookings/${params.id}/problem`, 'Added to the timeline.');
	}
} satisfies Actions;

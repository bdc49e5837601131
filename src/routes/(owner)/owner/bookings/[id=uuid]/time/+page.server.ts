import { requireConfirmedRole, requireRole } from '$lib/server/http/guards';
import { bookingTimeActions, loadBookingTime } from '$lib/server/http/booking-time';
import type { Actions, PageServerLoad } from './$types';

const who = () => ({ id: requireRole('owner').id, side: 'owner' as const });
const acting = () => ({ id: requireConfirmedRole('owner').id, side: 'owner' as const });

export const load: PageServerLoad = ({ params }) => loadBookingTime(params.id, who());

export const actions = {
	propose: ({ request, params, cookies }) =>
		bookingTimeActions.propose(request, params.id, acting(), cookies),
	accept: ({ params, cookies }) =>
		bookingTimeActions.answer(params.id, acting(), 'accept', cookies),
	decline: ({ params, cookies }) =>
		bookingTimeActions.answer(params.id, acting(), 'decline', cookies),
	withdraw: ({ params, cookies }) => bookingTimeActions.withdraw(params.id, acting(), cookies)
} satisfies Actions;

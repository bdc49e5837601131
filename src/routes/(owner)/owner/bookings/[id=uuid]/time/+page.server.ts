import { bookingTimePage } from '$lib/server/http/booking-time';
import type { Actions, PageServerLoad } from './$types';

const page = bookingTimePage('owner');

export const load: PageServerLoad = page.load;
// Named one by one so the route tree shows them (the access matrix and fuzz suite read it).
export const actions = {
	propose: page.actions.propose,
	accept: page.actions.accept,
	decline: page.actions.decline,
	withdraw: page.actions.withdraw
} satisfies Actions;

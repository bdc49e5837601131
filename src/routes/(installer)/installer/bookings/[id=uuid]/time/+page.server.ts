import { bookingTimePage } from '$lib/server/http/booking-time';
import type { Actions, PageServerLoad } from './$types';

const page = bookingTimePage('installer');

export const load: PageServerLoad = page.load;
export const actions = page.actions satisfies Actions;

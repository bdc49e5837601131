/**
 * The "Booking time" page of either side (/owner/bookings/[id]/time and
 * /installer/bookings/[id]/time): its load and actions, written once. Each route takes them from
 * `bookingTimePage(side)`, which checks the side's role before anything else, so the role area and
 * the row check both hold.
 */
import { error, fail, type Cookies } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { proposeTimeSchema } from '$lib/forms/reschedule';
import { PROPOSAL_STATUS_LABELS } from '$lib/labels';
import { formatSlotLabel } from '$lib/work/schedule';
import { formatDayTime } from '$lib/time';
import {
	answerProposal,
	bookingPath,
	getBookingTimes,
	proposeNewTime,
	withdrawProposal,
	type Party
} from '../work/rescheduling';
import { requireConfirmedRole, requireRole } from './guards';
import { redirectWithNotice } from './notice';
import { refusalFail, refusalMessage } from './respond';

const NOT_FOUND = 'There is no such booking among yours.';

/** What the page shows: the booked time, any open proposal, the last answers, the form. */
export async function loadBookingTime(bookingId: string, who: Party) {
	const times = await getBookingTimes(bookingId, who);
	if (!times || times.status !== 'confirmed') error(404, NOT_FOUND);
	const zone = times.timeZone;
	const label = (p: { slotStart: Date; slotEnd: Date }) =>
		formatSlotLabel({ start: p.slotStart, end: p.slotEnd }, zone);
	return {
		title: times.title,
		timeZone: zone,
		slot: formatSlotLabel(times.slot, zone),
		movable: times.movable,
		open: times.open && {
			slot: label(times.open),
			mine: times.open.mine,
			note: times.open.note,
			proposedAt: formatDayTime(times.open.createdAt, zone)
		},
		answered: times.answered.map((p) => ({
			id: p.id,
			slot: label(p),
			status: PROPOSAL_STATUS_LABELS[p.status],
			by: p.side === who.side ? 'You' : who.side === 'owner' ? 'The installer' : 'The owner'
		})),
		back: bookingPath(who.side, { id: times.bookingId, jobId: times.jobId }),
		ics: `/${who.side}/bookings/${times.bookingId}/booking.ics`,
		form: await superValidate(zod4(proposeTimeSchema))
	};
}

const here = (who: Party, bookingId: string) => `/${who.side}/bookings/${bookingId}/time`;

/** The page's four actions for one side. */
export const bookingTimeActions = {
	async propose(request: Request, bookingId: string, who: Party, cookies: Cookies) {
		const form = await superValidate(request, zod4(proposeTimeSchema));
		if (!form.valid) return fail(400, { form });
		const made = await proposeNewTime(bookingId, who, form.data);
		if (!made.ok) return refusalMessage(form, made);
		redirectWithNotice(
			cookies,
			here(who, bookingId),
			'New time proposed. The other side is e-mailed; the booked time stands until they accept.'
		);
	},
	async answer(bookingId: string, who: Party, answer: 'accept' | 'decline', cookies: Cookies) {
		const done = await answerProposal(bookingId, who, answer);
		if (!done.ok) return refusalFail(done);
		redirectWithNotice(
			cookies,
			here(who, bookingId),
			answer === 'accept'
				? 'The booking has moved to the new time. Download the calendar file again to update your calendar.'
				: 'Declined: the booked time stands.'
		);
	},
	async withdraw(bookingId: string, who: Party, cookies: Cookies) {
		const done = await withdrawProposal(bookingId, who);
		if (!done.ok) return refusalFail(done);
		redirectWithNotice(cookies, here(who, bookingId), 'Proposal withdrawn.');
	}
};

interface TimeEvent {
	params: { id: string };
	request: Request;
	cookies: Cookies;
}

/** The load and actions of one side's "Booking time" page; the routes differ only in the side. */
export function bookingTimePage(side: Party['side']) {
	const who = (): Party => ({ id: requireRole(side).id, side });
	const acting = (): Party => ({ id: requireConfirmedRole(side).id, side });
	return {
		load: ({ params }: Pick<TimeEvent, 'params'>) => loadBookingTime(params.id, who()),
		actions: {
			propose: ({ request, params, cookies }: TimeEvent) =>
				bookingTimeActions.propose(request, params.id, acting(), cookies),
			accept: ({ params, cookies }: TimeEvent) =>
				bookingTimeActions.answer(params.id, acting(), 'accept', cookies),
			decline: ({ params, cookies }: TimeEvent) =>
				bookingTimeActions.answer(params.id, acting(), 'decline', cookies),
			withdraw: ({ params, cookies }: TimeEvent) =>
				bookingTimeActions.withdraw(params.id, acting(), cookies)
		}
	};
}

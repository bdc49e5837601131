/**
 * E-mails about a paid booking's time: a new time proposed, accepted, declined or withdrawn, and
 * the reminder the day before the fit.
 */
import { renderBlock as render, type RenderedEmail } from './layout';

interface ProposalData {
	/** Whom the e-mail greets. */
	greeting: string;
	/** Who proposed or answered, e.g. "Harbourline Fitting" or "Sam". */
	who: string;
	title: string;
	/** The booked time, as words. */
	current: string;
	/** The proposed time, as words. */
	proposed: string;
	url: string;
}

export type ScheduleEmail =
	| { template: 'reschedule-proposed'; data: ProposalData & { note: string | null } }
	| { template: 'reschedule-accepted'; data: ProposalData }
	| { template: 'reschedule-declined'; data: ProposalData }
	| { template: 'reschedule-withdrawn'; data: ProposalData }
	| {
			template: 'booking-reminder';
			data: { greeting: string; title: string; slot: string; where: string; url: string };
	  };

const TEMPLATES = new Set<string>([
	'reschedule-proposed',
	'reschedule-accepted',
	'reschedule-declined',
	'reschedule-withdrawn',
	'booking-reminder'
]);

/** Whether a message is one of these. */
export function isScheduleEmail(message: { template: string }): message is ScheduleEmail {
	return TEMPLATES.has(message.template);
}

/** Renders one of the schedule e-mails. */
export function renderScheduleEmail(message: ScheduleEmail): RenderedEmail {
	const d = message.data;
	switch (message.template) {
		case 'reschedule-proposed':
			return render(`New time proposed: ${d.title}`, {
				heading: `${message.data.greeting}, ${message.data.who} asks to move the fit`,
				paragraphs: [
					`Booked: ${message.data.current}.`,
					`Proposed: ${message.data.proposed}.`,
					...(message.data.note ? [`Their note: ${message.data.note}`] : []),
					'Accept it to move the booking, or decline to keep the booked time.'
				],
				action: { label: 'Answer the proposal', url: d.url },
				footnote: 'Until you answer, the booked time stands.'
			});
		case 'reschedule-accepted':
			return render(`New time agreed: ${d.title}`, {
				heading: `${message.data.greeting}, the fit has moved`,
				paragraphs: [
					`${message.data.who} accepted the new time: ${message.data.proposed} (was ${message.data.current}).`,
					'Download the calendar file again from the booking page to update your calendar.'
				],
				action: { label: 'See the booking', url: d.url }
			});
		case 'reschedule-declined':
			return render(`New time declined: ${d.title}`, {
				heading: `${message.data.greeting}, the booked time stands`,
				paragraphs: [
					`${message.data.who} declined moving the fit to ${message.data.proposed}.`,
					`The booking stays at ${message.data.current}. You can propose another time from the booking page.`
				],
				action: { label: 'See the booking', url: d.url }
			});
		case 'reschedule-withdrawn':
			return render(`Proposal withdrawn: ${d.title}`, {
				heading: `${message.data.greeting}, nothing to answer`,
				paragraphs: [
					`${message.data.who} withdrew the proposal to move the fit to ${message.data.proposed}.`,
					`The booking stays at ${message.data.current}.`
				],
				action: { label: 'See the booking', url: d.url }
			});
		case 'booking-reminder':
			return render(`Tomorrow: ${message.data.title}`, {
				heading: `${message.data.greeting}, the fit is tomorrow`,
				paragraphs: [
					`When: ${message.data.slot}.`,
					`Where: ${message.data.where}.`,
					'Need another time? Propose one from the booking page; the other side accepts or declines.'
				],
				action: { label: 'See the booking', url: message.data.url }
			});
	}
}

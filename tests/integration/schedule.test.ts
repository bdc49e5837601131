// A paid booking's time: proposals and answers, overlaps, the day-before reminder, the calendar
// file. Rules: the lifecycle issue's Schedule section (Tapline's own). Clock changes: IANA tz
// database, 'australasia', zone Australia/Adelaide, rule AS — UTC+10:30 from the first Sunday of
// October 02:00 local to the first Sunday of April 03:00 local, UTC+9:30 otherwise; 2027: ends
// Sunday 4 April, starts Sunday 3 October.
import { and, eq } from 'drizzle-orm';
import ICAL from 'ical.js';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { bookQuote } from '$lib/server/marketplace/bookings';
import { getBookingCalendarFile, getInstallerWeek } from '$lib/server/work/booking-calendar';
import { openConfirmationWindow } from '$lib/server/work/completion';
import { db } from '$lib/server/db';
import {
	booking,
	emailOutbox,
	installerBlockedDate,
	rescheduleProposal,
	user
} from '$lib/server/db/schema';
import { withMail } from '$lib/server/mail/outbox';
import { cancelPaidBooking } from '$lib/server/money/payments';
import { sendDueReminders } from '$lib/server/work/reminders';
import {
	answerProposal,
	proposeNewTime,
	withdrawProposal,
	type Party
} from '$lib/server/work/rescheduling';
import { submitQuote } from '$lib/server/marketplace/quotes';
import {
	ADELAIDE,
	goodQuote,
	makeOpenJob,
	makeUser,
	pricedParts,
	slotOn,
	workday
} from './matching-helpers';
import {
	bookAndOpenCheckout,
	paidBookingIn,
	startPaymentsWorld,
	type PaymentsWorld
} from './payments-helpers';

let world: PaymentsWorld;
beforeAll(async () => {
	world = await startPaymentsWorld();
});
afterAll(() => world.close());

const HOUR = 3_600_000;

async function paid() {
	const made = await paidBookingIn(world);
	const owner: Party = { id: made.ownerId, side: 'owner' };
	const installer: Party = { id: made.chosen.installerId, side: 'installer' };
	return { ...made, owner, installer };
}
async function bookingRow(id: string) {
	const [row] = await db.select().from(booking).where(eq(booking.id, id));
	return row!;
}
async function emailOf(id: string) {
	const [row] = await db.select({ email: user.email }).from(user).where(eq(user.id, id));
	return row!.email;
}
async function mailsTo(template: string, userId: string) {
	return db
		.select()
		.from(emailOutbox)
		.where(
			and(eq(emailOutbox.template, template), eq(emailOutbox.toAddress, await emailOf(userId)))
		);
}
const time = (date: string, start: string, end: string) => ({ date, start, end });

describe('proposing and answering a new time', () => {
	it('moves the booking when the other side accepts, with the e-mails both ways', async () => {
		const made = await paid();
		const before = await bookingRow(made.bookingId);
		const proposed = await proposeNewTime(made.bookingId, made.installer, {
			...time(workday(2), '13:00', '15:30'),
			note: 'Parts arrive a day late.'
		});
		expect(proposed.ok).toBe(true);
		const toOwner = await mailsTo('reschedule-proposed', made.ownerId);
		expect(toOwner).toHaveLength(1);
		expect(toOwner[0]!.text).toContain('Parts arrive a day late.');
		// The booked time stands until the answer.
		expect((await bookingRow(made.bookingId)).slotStart).toEqual(before.slotStart);

		const accepted = await answerProposal(made.bookingId, made.owner, 'accept');
		expect(accepted.ok).toBe(true);
		const after = await bookingRow(made.bookingId);
		const wanted = slotOn(workday(2), '13:00', '15:30');
		expect(after.slotStart).toEqual(wanted.start);
		expect(after.slotEnd).toEqual(wanted.end);
		expect(after.calendarSequence).toBe(before.calendarSequence + 1);
		expect(await mailsTo('reschedule-accepted', made.chosen.installerId)).toHaveLength(1);
		const [p] = await db
			.select()
			.from(rescheduleProposal)
			.where(eq(rescheduleProposal.bookingId, made.bookingId));
		expect(p?.status).toBe('accepted');
	});

	it('keeps the booked time on a decline and lets the proposer withdraw', async () => {
		const made = await paid();
		const before = await bookingRow(made.bookingId);
		expect(
			(await proposeNewTime(made.bookingId, made.owner, time(workday(3), '09:00', '11:00'))).ok
		).toBe(true);
		expect(await answerProposal(made.bookingId, made.installer, 'decline')).toEqual({
			ok: true,
			slot: null
		});
		expect(await mailsTo('reschedule-declined', made.ownerId)).toHaveLength(1);
		const kept = await bookingRow(made.bookingId);
		expect(kept.slotStart).toEqual(before.slotStart);
		expect(kept.calendarSequence).toBe(before.calendarSequence);

		expect(
			(await proposeNewTime(made.bookingId, made.owner, time(workday(3), '10:00', '12:00'))).ok
		).toBe(true);
		// Only the proposer withdraws; only the other side answers.
		expect(await withdrawProposal(made.bookingId, made.installer)).toMatchObject({ status: 409 });
		expect(await answerProposal(made.bookingId, made.owner, 'accept')).toMatchObject({
			status: 409
		});
		expect(await withdrawProposal(made.bookingId, made.owner)).toEqual({ ok: true });
		expect(await answerProposal(made.bookingId, made.installer, 'accept')).toMatchObject({
			status: 409
		});
		expect((await bookingRow(made.bookingId)).slotStart).toEqual(before.slotStart);
	});

	it('allows one open proposal at a time, from either side', async () => {
		const made = await paid();
		expect(
			(await proposeNewTime(made.bookingId, made.owner, time(workday(3), '09:00', '11:00'))).ok
		).toBe(true);
		expect(
			await proposeNewTime(made.bookingId, made.owner, time(workday(4), '09:00', '11:00'))
		).toMatchObject({ ok: false, status: 409 });
		expect(
			await proposeNewTime(made.bookingId, made.installer, time(workday(4), '09:00', '11:00'))
		).toMatchObject({ ok: false, status: 409 });
		const open = await db
			.select()
			.from(rescheduleProposal)
			.where(
				and(eq(rescheduleProposal.bookingId, made.bookingId), eq(rescheduleProposal.status, 'open'))
			);
		expect(open).toHaveLength(1);
	});

	it("answers 404 for someone else's booking", async () => {
		const made = await paid();
		const stranger = await makeUser('owner');
		const otherInstaller = await makeUser('installer');
		const input = time(workday(3), '09:00', '11:00');
		expect(
			await proposeNewTime(made.bookingId, { id: stranger.id, side: 'owner' }, input)
		).toMatchObject({ status: 404 });
		expect(
			await proposeNewTime(made.bookingId, { id: otherInstaller.id, side: 'installer' }, input)
		).toMatchObject({ status: 404 });
		// The owner's id on the installer's side is not the installer.
		expect(
			await proposeNewTime(made.bookingId, { id: made.ownerId, side: 'installer' }, input)
		).toMatchObject({ status: 404 });
		expect((await proposeNewTime(made.bookingId, made.owner, input)).ok).toBe(true);
		expect(
			await answerProposal(made.bookingId, { id: stranger.id, side: 'owner' }, 'accept')
		).toMatchObject({ status: 404 });
		expect(
			await withdrawProposal(made.bookingId, { id: otherInstaller.id, side: 'installer' })
		).toMatchObject({ status: 404 });
	});

	it('refuses bad input with the field at fault (400)', async () => {
		const made = await paid();
		const backwards = await proposeNewTime(
			made.bookingId,
			made.owner,
			time(workday(3), '11:00', '09:00')
		);
		expect(backwards).toMatchObject({ status: 400, fields: { end: expect.any(String) } });
		const past = await proposeNewTime(
			made.bookingId,
			made.owner,
			time('2020-01-06', '09:00', '11:00')
		);
		expect(past).toMatchObject({ status: 400, fields: { start: expect.any(String) } });
		// The owner cannot pick a time outside the installer's hours (8 am – 5 pm weekdays).
		const evening = await proposeNewTime(
			made.bookingId,
			made.owner,
			time(workday(3), '17:30', '19:00')
		);
		expect(evening).toMatchObject({ status: 400, fields: { start: expect.any(String) } });
		const b = await bookingRow(made.bookingId);
		const same = await proposeNewTime(
			made.bookingId,
			made.owner,
			time(workday(0), '09:00', '11:00')
		);
		expect(b.slotStart).toEqual(slotOn(workday(0), '09:00', '11:00').start);
		expect(same).toMatchObject({ status: 400 });
		// A day the installer marked off is refused to both sides, with the date at fault.
		await db
			.insert(installerBlockedDate)
			.values({ installerId: made.chosen.installerId, day: workday(4) });
		for (const side of [made.owner, made.installer]) {
			expect(
				await proposeNewTime(made.bookingId, side, time(workday(4), '09:00', '11:00'))
			).toMatchObject({ status: 400, fields: { date: expect.any(String) } });
		}
		// The installer may offer their own evening.
		expect(
			(await proposeNewTime(made.bookingId, made.installer, time(workday(3), '17:30', '19:00'))).ok
		).toBe(true);
	});

	it('refuses a booking not paid (409) and work already reported (409)', async () => {
		const unpaid = await bookAndOpenCheckout();
		expect(
			await proposeNewTime(
				unpaid.bookingId,
				{ id: unpaid.ownerId, side: 'owner' },
				time(workday(3), '09:00', '11:00')
			)
		).toMatchObject({ status: 409 });

		const made = await paid();
		expect(
			(await proposeNewTime(made.bookingId, made.installer, time(workday(3), '09:00', '11:00'))).ok
		).toBe(true);
		const reported = await withMail((tx, mail) =>
			openConfirmationWindow(tx, mail, made.bookingId, new Date())
		);
		expect(reported.ok).toBe(true);
		// The open proposal can no longer be accepted, nor a new one made; declining still works.
		expect(await answerProposal(made.bookingId, made.owner, 'accept')).toMatchObject({
			status: 409
		});
		expect(await answerProposal(made.bookingId, made.owner, 'decline')).toMatchObject({ ok: true });
		expect(
			await proposeNewTime(made.bookingId, made.owner, time(workday(4), '09:00', '11:00'))
		).toMatchObject({ status: 409 });
	});
});

describe('a cancelled booking', () => {
	it('closes a new time still waiting for an answer', async () => {
		const made = await paid();
		expect(
			(await proposeNewTime(made.bookingId, made.installer, time(workday(3), '09:00', '11:00'))).ok
		).toBe(true);
		const cancelled = await cancelPaidBooking(made.bookingId, 'owner', made.ownerId);
		expect(cancelled.ok).toBe(true);
		const proposals = await db
			.select({ status: rescheduleProposal.status, answeredAt: rescheduleProposal.answeredAt })
			.from(rescheduleProposal)
			.where(eq(rescheduleProposal.bookingId, made.bookingId));
		expect(proposals).toHaveLength(1);
		expect(proposals[0]!.status).toBe('withdrawn');
		expect(proposals[0]!.answeredAt).toBeInstanceOf(Date);
	});

	it('gets a calendar file that cancels the event: same UID, SEQUENCE raised', async () => {
		const made = await paid();
		const booked = await getBookingCalendarFile(made.bookingId, made.owner);
		if (!booked.ok) throw new Error(booked.message);
		expect((await cancelPaidBooking(made.bookingId, 'owner', made.ownerId)).ok).toBe(true);
		for (const side of [made.owner, made.installer]) {
			const file = await getBookingCalendarFile(made.bookingId, side);
			if (!file.ok) throw new Error(file.message);
			const calendar = new ICAL.Component(ICAL.parse(file.ics));
			expect(calendar.getFirstPropertyValue('method')).toBe('CANCEL');
			expect(calendar.getFirstSubcomponent('vevent')?.getFirstPropertyValue('status')).toBe(
				'CANCELLED'
			);
			const event = parseEvent(file.ics);
			expect(event.uid).toBe(parseEvent(booked.ics).uid);
			expect(event.sequence).toBe(parseEvent(booked.ics).sequence + 1);
		}
	});
});

describe('overlaps with the installer’s other bookings', () => {
	/** A provisional booking of another job with the same installer at `slot`. */
	async function otherBooking(installerId: string, slots: Array<{ start: Date; end: Date }>) {
		const other = await makeOpenJob(ADELAIDE);
		const sent = await submitQuote(installerId, other.job.id, {
			...goodQuote(pricedParts(other.job)),
			slots
		});
		if (!sent.ok) throw new Error(sent.message);
		const booked = await bookQuote(
			other.ownerId,
			other.job.id,
			sent.quoteId,
			slots[0]!.start.toISOString()
		);
		if (!booked.ok) throw new Error(booked.message);
		return booked.bookingId;
	}

	it('refuses a proposal overlapping another live booking (409)', async () => {
		const made = await paid();
		await otherBooking(made.chosen.installerId, [
			slotOn(workday(2), '10:00', '12:00'),
			slotOn(workday(4), '10:00', '12:00')
		]);
		const clash = await proposeNewTime(
			made.bookingId,
			made.installer,
			time(workday(2), '11:00', '13:00')
		);
		expect(clash).toMatchObject({ ok: false, status: 409 });
		// Touching end to start is not an overlap.
		expect(
			(await proposeNewTime(made.bookingId, made.installer, time(workday(2), '12:00', '14:00'))).ok
		).toBe(true);
	});

	it('refuses to accept when the time was booked after the proposal (409), and keeps the slot', async () => {
		const made = await paid();
		const before = await bookingRow(made.bookingId);
		expect(
			(await proposeNewTime(made.bookingId, made.owner, time(workday(3), '09:00', '11:00'))).ok
		).toBe(true);
		await otherBooking(made.chosen.installerId, [
			slotOn(workday(3), '10:00', '12:00'),
			slotOn(workday(4), '13:00', '15:00')
		]);
		expect(await answerProposal(made.bookingId, made.installer, 'accept')).toMatchObject({
			status: 409
		});
		expect((await bookingRow(made.bookingId)).slotStart).toEqual(before.slotStart);
	});
});

describe('the day-before reminder', () => {
	it('goes once to each side even with two runs at once, and again for a new time', async () => {
		const made = await paid();
		const b = await bookingRow(made.bookingId);
		const early = new Date(b.slotStart.getTime() - 25 * HOUR);
		expect(await sendDueReminders(early)).not.toContain(made.bookingId);

		const due = new Date(b.slotStart.getTime() - 23 * HOUR);
		const [first, second] = await Promise.all([sendDueReminders(due), sendDueReminders(due)]);
		const runs = [...first, ...second].filter((id) => id === made.bookingId);
		expect(runs).toHaveLength(1);
		expect(await sendDueReminders(due)).not.toContain(made.bookingId);
		expect(await mailsTo('booking-reminder', made.ownerId)).toHaveLength(1);
		const toInstaller = await mailsTo('booking-reminder', made.chosen.installerId);
		expect(toInstaller).toHaveLength(1);
		// The installer's reminder carries the exact address, now that the booking is paid.
		expect(toInstaller[0]!.text).toContain('1 Secret Street');

		expect(
			(await proposeNewTime(made.bookingId, made.installer, time(workday(4), '09:00', '11:00'))).ok
		).toBe(true);
		expect((await answerProposal(made.bookingId, made.owner, 'accept')).ok).toBe(true);
		const moved = await bookingRow(made.bookingId);
		expect(moved.reminderSentAt).toBeNull();
		await Promise.all([
			sendDueReminders(new Date(moved.slotStart.getTime() - 23 * HOUR)),
			sendDueReminders(new Date(moved.slotStart.getTime() - 22 * HOUR))
		]);
		expect(await mailsTo('booking-reminder', made.ownerId)).toHaveLength(2);
		expect(await mailsTo('booking-reminder', made.chosen.installerId)).toHaveLength(2);
	});

	it('is not sent for work already reported', async () => {
		const made = await paid();
		const b = await bookingRow(made.bookingId);
		await withMail((tx, mail) => openConfirmationWindow(tx, mail, made.bookingId, new Date()));
		expect(await sendDueReminders(new Date(b.slotStart.getTime() - 23 * HOUR))).not.toContain(
			made.bookingId
		);
	});
});

/** The one event of an .ics text, read by ical.js (not the library that wrote it). */
function parseEvent(text: string) {
	const calendar = new ICAL.Component(ICAL.parse(text));
	const vevent = calendar.getFirstSubcomponent('vevent');
	if (!vevent) throw new Error('no VEVENT');
	const event = new ICAL.Event(vevent);
	return {
		uid: event.uid,
		sequence: event.sequence,
		summary: event.summary,
		location: event.location,
		start: event.startDate.toJSDate(),
		end: event.endDate.toJSDate()
	};
}

/** Wall-clock time in Adelaide, read with the runtime's own tz data (not Tapline's helpers). */
const adelaide = (d: Date) =>
	new Intl.DateTimeFormat('en-CA', {
		timeZone: 'Australia/Adelaide',
		year: 'numeric',
		month: '2-digit',
		day: '2-digit',
		hour: '2-digit',
		minute: '2-digit',
		hourCycle: 'h23'
	})
		.format(d)
		.replace(',', '');

describe('the calendar file', () => {
	async function moveTo(
		made: Awaited<ReturnType<typeof paid>>,
		slot: { date: string; start: string; end: string },
		now: Date
	) {
		const proposed = await proposeNewTime(made.bookingId, made.installer, slot, now);
		expect(proposed.ok).toBe(true);
		const accepted = await answerProposal(made.bookingId, made.owner, 'accept', now);
		expect(accepted.ok).toBe(true);
		const file = await getBookingCalendarFile(made.bookingId, made.installer);
		if (!file.ok) throw new Error(file.message);
		return parseEvent(file.ics);
	}

	it('parses with another library at the right local time on both sides of April’s change', async () => {
		const made = await paid();
		const first = await getBookingCalendarFile(made.bookingId, made.owner);
		if (!first.ok) throw new Error(first.message);
		const booked = parseEvent(first.ics);
		expect(booked.sequence).toBe(0);
		expect(booked.uid).toBe(`booking-${made.bookingId}@tapline`);

		const march = new Date('2027-03-01T00:00:00Z');
		// Saturday 3 April 2027, 9:00 am daylight time (UTC+10:30) = 22:30 UTC on the 2nd.
		const saturday = await moveTo(made, time('2027-04-03', '09:00', '11:00'), march);
		expect(saturday.start.toISOString()).toBe('2027-04-02T22:30:00.000Z');
		expect(adelaide(saturday.start)).toBe('2027-04-03 09:00');
		expect(adelaide(saturday.end)).toBe('2027-04-03 11:00');
		expect(saturday.sequence).toBe(1);
		expect(saturday.uid).toBe(booked.uid);
		expect(saturday.location).toContain('1 Secret Street');

		// Monday 5 April 2027, 9:00 am standard time (UTC+9:30) = 23:30 UTC on the 4th.
		const monday = await moveTo(made, time('2027-04-05', '09:00', '11:00'), march);
		expect(monday.start.toISOString()).toBe('2027-04-04T23:30:00.000Z');
		expect(adelaide(monday.start)).toBe('2027-04-05 09:00');
		expect(monday.sequence).toBe(2);

		// Across the change itself: Sunday 4 April, 1:00 am ACDT to 4:00 am ACST is four real hours.
		const across = await moveTo(made, time('2027-04-04', '01:00', '04:00'), march);
		expect(adelaide(across.start)).toBe('2027-04-04 01:00');
		expect(adelaide(across.end)).toBe('2027-04-04 04:00');
		expect(across.end.getTime() - across.start.getTime()).toBe(4 * HOUR);
		expect(across.sequence).toBe(3);
	});

	it('parses at the right local time on both sides of October’s change', async () => {
		const made = await paid();
		const september = new Date('2027-09-01T00:00:00Z');
		// Saturday 2 October 2027, 9:00 am standard time (UTC+9:30) = 23:30 UTC on the 1st.
		const before = await moveTo(made, time('2027-10-02', '09:00', '10:30'), september);
		expect(before.start.toISOString()).toBe('2027-10-01T23:30:00.000Z');
		expect(adelaide(before.start)).toBe('2027-10-02 09:00');
		expect(adelaide(before.end)).toBe('2027-10-02 10:30');
		// Monday 4 October 2027, 9:00 am daylight time (UTC+10:30) = 22:30 UTC on the 3rd.
		const after = await moveTo(made, time('2027-10-04', '09:00', '10:30'), september);
		expect(after.start.toISOString()).toBe('2027-10-03T22:30:00.000Z');
		expect(adelaide(after.start)).toBe('2027-10-04 09:00');
		// Sunday 3 October: 1:00 am ACST to 4:00 am ACDT is two real hours (2–3 am never happens).
		const across = await moveTo(made, time('2027-10-03', '01:00', '04:00'), september);
		expect(across.end.getTime() - across.start.getTime()).toBe(2 * HOUR);
		expect(adelaide(across.end)).toBe('2027-10-03 04:00');
	});

	it("is only for the booking's two sides, once paid", async () => {
		const made = await paid();
		const stranger = await makeUser('installer');
		expect(
			await getBookingCalendarFile(made.bookingId, { id: stranger.id, side: 'installer' })
		).toMatchObject({ ok: false, status: 404 });
		expect(
			await getBookingCalendarFile(made.bookingId, { id: made.ownerId, side: 'installer' })
		).toMatchObject({ ok: false, status: 404 });
		const unpaid = await bookAndOpenCheckout();
		expect(
			await getBookingCalendarFile(unpaid.bookingId, { id: unpaid.ownerId, side: 'owner' })
		).toMatchObject({ ok: false, status: 409 });
		const own = await getBookingCalendarFile(made.bookingId, made.owner);
		expect(own.ok && parseEvent(own.ics).summary).toContain('Dash cam fit');
	});
});

describe("the installer's week", () => {
	it('shows a paid booking on its local day beside the day’s hours; another week is empty', async () => {
		const made = await paid();
		const b = await bookingRow(made.bookingId);
		const week = await getInstallerWeek(made.chosen.installerId, workday(0), new Date());
		expect(week).not.toBeNull();
		const shown = week!.days.flatMap((d) => d.bookings.map((x) => ({ date: d.date, ...x })));
		expect(shown).toEqual([
			expect.objectContaining({
				id: b.id,
				date: workday(0),
				time: '9:00 am – 11:00 am',
				status: 'confirmed',
				suburb: 'Adelaide'
			})
		]);
		expect(week!.days.find((d) => d.date === workday(0))?.hours).toEqual(['8:00 am – 5:00 pm']);
		const otherWeek = await getInstallerWeek(made.chosen.installerId, '2030-01-07', new Date());
		expect(otherWeek!.days.every((d) => d.bookings.length === 0)).toBe(true);
	});
});

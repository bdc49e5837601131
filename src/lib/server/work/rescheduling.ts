/**
 * Moving a paid booking to another time, by proposal and answer: either side proposes a new slot
 * ({@link proposeNewTime}), the other accepts or declines ({@link answerProposal}), the proposer
 * may withdraw ({@link withdrawProposal}). One open proposal per booking (a partial unique index
 * backs the check), only while the work is still to be fitted. Every step locks the booking row
 * first, so a proposal and an answer, or two answers, take turns; acceptance moves the booking's
 * slot, bumps its calendar SEQUENCE and clears the reminder marker in the same transaction, with
 * the installer's exclusion constraint as the last word on overlaps. The other side is e-mailed
 * in the step's own transaction.
 */
import { and, desc, eq, gt, lt, ne, or } from 'drizzle-orm';
import { titleOrUntitled } from '$lib/marketplace/posted-job';
import { checkProposedSlot, type ProposedTime } from '$lib/work/reschedule';
import { formatSlotLabel, isWithinWorkingHours, type Interval } from '$lib/work/schedule';
import { formatInZone } from '$lib/time';
import { db, type Tx } from '../db';
import { booking, installerProfile, job, notice, rescheduleProposal, user } from '../db/schema';
import { lockFitBooking } from './completion';
import { loadDiary } from './diary';
import { appUrl } from '../mail/app-url';
import { withMail, type Mail } from '../mail/outbox';
import type { ScheduleEmail } from '../mail/schedule';
import { refuse, type Refusal } from '../refusal';

export type Side = 'owner' | 'installer';
export interface Party {
	id: string;
	side: Side;
}

const NOT_YOURS = 'There is no such booking among yours.';
const OVERLAP =
	'That time overlaps another booking of the installer. Choose a time that is free in their calendar.';

type Locked = NonNullable<Awaited<ReturnType<typeof lockFitBooking>>>;

/** The booking's page for one side. */
export const bookingPath = (side: Side, b: { id: string; jobId: string }) =>
	side === 'owner' ? `/owner/bookings/${b.id}` : `/installer/jobs/${b.jobId}`;

const isParty = (row: Locked, who: Party) =>
	who.side === 'owner' ? row.booking.ownerId === who.id : row.booking.installerId === who.id;

/** Refuses a booking that is not paid, or whose work is past the stage where its time can move. */
function checkMovable(row: Locked): Refusal | null {
	if (row.booking.status !== 'confirmed' || !row.paidAt) {
		return refuse(409, 'Only a paid booking can move to another time.');
	}
	if (row.booking.stage !== 'to_fit') {
		return refuse(409, 'The fit has been reported, so its time can no longer move.');
	}
	return null;
}

async function openProposal(tx: Tx, bookingId: string) {
	const [row] = await tx
		.select()
		.from(rescheduleProposal)
		.where(and(eq(rescheduleProposal.bookingId, bookingId), eq(rescheduleProposal.status, 'open')));
	return row ?? null;
}

/** Whether the installer has another live booking sharing time with `slot`. */
async function clashes(tx: Tx, row: Locked, slot: Interval, now: Date): Promise<boolean> {
	const [other] = await tx
		.select({ id: booking.id })
		.from(booking)
		.where(
			and(
				eq(booking.installerId, row.booking.installerId),
				ne(booking.id, row.booking.id),
				lt(booking.slotStart, slot.end),
				gt(booking.slotEnd, slot.start),
				or(
					eq(booking.status, 'confirmed'),
					and(eq(booking.status, 'awaiting_payment'), gt(booking.holdExpiresAt, now))
				)
			)
		)
		.limit(1);
	return other !== undefined;
}

/** The people of a booking: each side's address and the name the other side knows them by. */
async function people(tx: Tx, row: Locked) {
	const [installer] = await tx
		.select({ email: user.email, name: installerProfile.businessName })
		.from(installerProfile)
		.innerJoin(user, eq(user.id, installerProfile.userId))
		.where(eq(installerProfile.userId, row.booking.installerId));
	if (!installer) throw new Error(`installer ${row.booking.installerId} missing`);
	return {
		owner: { email: row.ownerEmail, name: row.ownerName },
		installer
	};
}

/** E-mails and notifies the side other than `from` about a proposal. */
async function tellOtherSide(
	tx: Tx,
	mail: Mail,
	row: Locked,
	from: Side,
	template: ScheduleEmail['template'],
	proposed: Interval,
	note: string | null,
	now: Date
) {
	const who = await people(tx, row);
	const to: Side = from === 'owner' ? 'installer' : 'owner';
	const title = titleOrUntitled(row.title);
	const data = {
		greeting: `Hi ${who[to].name}`,
		who: who[from].name,
		title,
		current: formatSlotLabel(
			{ start: row.booking.slotStart, end: row.booking.slotEnd },
			row.timeZone,
			now
		),
		proposed: formatSlotLabel(proposed, row.timeZone, now),
		url: appUrl(bookingPath(to, row.booking))
	};
	const message =
		template === 'reschedule-proposed'
			? ({ template, data: { ...data, note } } as const)
			: ({ template, data } as ScheduleEmail);
	await mail.send(who[to].email, message);
	const words: Partial<Record<ScheduleEmail['template'], string>> = {
		'reschedule-proposed': `${who[from].name} proposes a new time for the ${title}: ${data.proposed}.`,
		'reschedule-accepted': `${who[from].name} accepted the new time for the ${title}: ${data.proposed}.`,
		'reschedule-declined': `${who[from].name} declined the new time for the ${title}; it stays at ${data.current}.`
	};
	const text = words[template];
	if (text) {
		await tx.insert(notice).values({
			userId: to === 'owner' ? row.booking.ownerId : row.booking.installerId,
			text,
			link: bookingPath(to, row.booking)
		});
	}
}

/** Locks the booking and checks the caller is one of its two sides. */
async function lockForParty(tx: Tx, bookingId: string, who: Party) {
	const row = await lockFitBooking(tx, bookingId);
	if (!row || !isParty(row, who)) return refuse(404, NOT_YOURS);
	return row;
}

export type ProposalOutcome = { ok: true; proposalId: string } | Refusal;

/**
 * Proposes a new time for a paid booking still to be fitted. Refused: not the caller's booking
 * (404); not paid, fit reported, a proposal already open, or a time that overlaps another of the
 * installer's live bookings (409); a time that cannot be read, is the booked time, starts under
 * 2 hours away or over 90 days ahead, falls on a day the installer marked off, or, proposed by
 * the owner, falls outside the installer's working hours (400, with the field at fault). The
 * installer may propose outside their usual hours: it is their own time.
 */
export async function proposeNewTime(
	bookingId: string,
	who: Party,
	input: ProposedTime & { note?: string | null },
	now = new Date()
): Promise<ProposalOutcome> {
	return withMail(async (tx, mail) => {
		const row = await lockForParty(tx, bookingId, who);
		if ('ok' in row) return row;
		const unmovable = checkMovable(row);
		if (unmovable) return unmovable;
		const open = await openProposal(tx, bookingId);
		if (open) {
			return refuse(
				409,
				open.proposerSide === who.side
					? 'You already proposed a new time; withdraw it first to propose another.'
					: 'The other side proposed a new time; accept or decline it first.'
			);
		}
		const checked = checkProposedSlot(input, row.timeZone, now);
		if (!checked.ok) {
			const [first] = Object.values(checked.fields);
			return refuse(400, first ?? 'Check the new time.', { fields: checked.fields });
		}
		const slot = checked.slot;
		if (
			slot.start.getTime() === row.booking.slotStart.getTime() &&
			slot.end.getTime() === row.booking.slotEnd.getTime()
		) {
			return refuse(400, 'That is the booked time already.', {
				fields: { start: 'Choose a time other than the booked one.' }
			});
		}
		const diary = await loadDiary(row.booking.installerId, now, tx);
		if (diary.blocked.includes(formatInZone(slot.start, row.timeZone, 'yyyy-MM-dd'))) {
			const field =
				who.side === 'installer'
					? 'You marked this day off; open it again on your Hours page first.'
					: 'The installer is not working that day. Choose another date.';
			return refuse(400, field, { fields: { date: field } });
		}
		if (
			who.side === 'owner' &&
			diary.hours.length > 0 &&
			!isWithinWorkingHours(slot, diary.hours, diary.blocked, row.timeZone)
		) {
			return refuse(400, "That time is outside the installer's working hours.", {
				fields: { start: "Choose a time inside the installer's working hours, on a day they work." }
			});
		}
		if (await clashes(tx, row, slot, now)) return refuse(409, OVERLAP);
		const [made] = await tx
			.insert(rescheduleProposal)
			.values({
				bookingId,
				proposedBy: who.id,
				proposerSide: who.side,
				slotStart: slot.start,
				slotEnd: slot.end,
				note: input.note?.trim() || null,
				createdAt: now
			})
			.returning({ id: rescheduleProposal.id });
		if (!made) throw new Error('proposal insert returned no row');
		await tellOtherSide(
			tx,
			mail,
			row,
			who.side,
			'reschedule-proposed',
			slot,
			input.note?.trim() || null,
			now
		);
		return { ok: true as const, proposalId: made.id };
	});
}

/** The PostgreSQL error code of a failed query, looking through Drizzle's wrapper. */
function pgCode(err: unknown): string | undefined {
	let current: unknown = err;
	for (let depth = 0; current && depth < 5; depth++) {
		const code = (current as { code?: unknown }).code;
		if (typeof code === 'string' && /^[0-9A-Z]{5}$/.test(code)) return code;
		current = (current as { cause?: unknown }).cause;
	}
	return undefined;
}

export type AnswerOutcome = { ok: true; slot: Interval | null } | Refusal;

/**
 * The other side's answer to the open proposal. Accepting moves the booking to the proposed
 * time (409 when the work has moved on, the time has passed, or the installer's time was taken
 * meanwhile: then the proposal stays open for a decline); declining keeps the booked time.
 * The proposer cannot answer their own proposal (409).
 */
export async function answerProposal(
	bookingId: string,
	who: Party,
	answer: 'accept' | 'decline',
	now = new Date()
): Promise<AnswerOutcome> {
	return withMail(async (tx, mail) => {
		const row = await lockForParty(tx, bookingId, who);
		if ('ok' in row) return row;
		const open = await openProposal(tx, bookingId);
		if (!open) return refuse(409, 'There is no proposal waiting for an answer.');
		if (open.proposerSide === who.side) {
			return refuse(409, 'You proposed this time; the other side answers it.');
		}
		const slot = { start: open.slotStart, end: open.slotEnd };
		if (answer === 'accept') {
			const unmovable = checkMovable(row);
			if (unmovable) return unmovable;
			if (open.slotStart.getTime() <= now.getTime()) {
				return refuse(409, 'The proposed time has already begun. Decline it and propose another.');
			}
			if (await clashes(tx, row, slot, now)) return refuse(409, OVERLAP);
			try {
				await tx.transaction(async (sp) => {
					await sp
						.update(booking)
						.set({
							slotStart: open.slotStart,
							slotEnd: open.slotEnd,
							calendarSequence: row.booking.calendarSequence + 1,
							reminderSentAt: null
						})
						.where(eq(booking.id, bookingId));
				});
			} catch (err) {
				if (pgCode(err) === '23P01') return refuse(409, OVERLAP);
				throw err;
			}
		}
		await tx
			.update(rescheduleProposal)
			.set({ status: answer === 'accept' ? 'accepted' : 'declined', answeredAt: now })
			.where(eq(rescheduleProposal.id, open.id));
		await tellOtherSide(
			tx,
			mail,
			row,
			who.side,
			answer === 'accept' ? 'reschedule-accepted' : 'reschedule-declined',
			slot,
			null,
			now
		);
		return { ok: true as const, slot: answer === 'accept' ? slot : null };
	});
}

/** The proposer takes back their open proposal; the booked time stands. */
export async function withdrawProposal(
	bookingId: string,
	who: Party,
	now = new Date()
): Promise<{ ok: true } | Refusal> {
	return withMail(async (tx, mail) => {
		const row = await lockForParty(tx, bookingId, who);
		if ('ok' in row) return row;
		const open = await openProposal(tx, bookingId);
		if (open?.proposerSide !== who.side) {
			return refuse(409, 'You have no proposal waiting to withdraw.');
		}
		await tx
			.update(rescheduleProposal)
			.set({ status: 'withdrawn', answeredAt: now })
			.where(eq(rescheduleProposal.id, open.id));
		await tellOtherSide(
			tx,
			mail,
			row,
			who.side,
			'reschedule-withdrawn',
			{ start: open.slotStart, end: open.slotEnd },
			null,
			now
		);
		return { ok: true as const };
	});
}

/**
 * What a booking's page shows about its time for one side: the booked slot, whether it can move,
 * the open proposal and the last few answered ones. Null for someone else's booking.
 */
export async function getBookingTimes(bookingId: string, who: Party) {
	const [row] = await db
		.select({
			id: booking.id,
			jobId: booking.jobId,
			title: job.title,
			timeZone: job.timeZone,
			ownerId: booking.ownerId,
			installerId: booking.installerId,
			status: booking.status,
			stage: booking.stage,
			slotStart: booking.slotStart,
			slotEnd: booking.slotEnd
		})
		.from(booking)
		.innerJoin(job, eq(job.id, booking.jobId))
		.where(eq(booking.id, bookingId));
	if (!row || (who.side === 'owner' ? row.ownerId : row.installerId) !== who.id) return null;
	const proposals = await db
		.select({
			id: rescheduleProposal.id,
			side: rescheduleProposal.proposerSide,
			status: rescheduleProposal.status,
			slotStart: rescheduleProposal.slotStart,
			slotEnd: rescheduleProposal.slotEnd,
			note: rescheduleProposal.note,
			createdAt: rescheduleProposal.createdAt
		})
		.from(rescheduleProposal)
		.where(eq(rescheduleProposal.bookingId, bookingId))
		.orderBy(desc(rescheduleProposal.createdAt))
		.limit(6);
	const open = proposals.find((p) => p.status === 'open') ?? null;
	return {
		bookingId: row.id,
		jobId: row.jobId,
		title: titleOrUntitled(row.title),
		timeZone: row.timeZone,
		status: row.status,
		slot: { start: row.slotStart, end: row.slotEnd },
		movable: row.status === 'confirmed' && row.stage === 'to_fit',
		open: open && { ...open, mine: open.side === who.side },
		answered: proposals.filter((p) => p.status !== 'open').slice(0, 5)
	};
}

// Disputes: the owner raises a problem inside the confirmation window, the installer answers, and
// an admin not party to the booking settles it with the money moved at the provider and in the
// ledger in one transaction. Rules: the lifecycle issue's "Disputes" section (Tapline's own);
// fee maths: the payments issue (10 % with a $15.00 minimum, GST 1/11 per the ATO).
import { and, eq } from 'drizzle-orm';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { confirmOverdueWork, openConfirmationWindow } from '$lib/server/work/completion';
import { db } from '$lib/server/db';
import {
	adminAudit,
	booking,
	dispute,
	disputeEvent,
	emailOutbox,
	ledgerEntry,
	ledgerTransaction,
	payment,
	user
} from '$lib/server/db/schema';
import {
	addAdminNote,
	addDisputeEntry,
	findViewableDisputePhoto,
	getDisputeForParty,
	listDisputes,
	openDispute,
	settleDispute
} from '$lib/server/work/disputes';
import { findLedgerProblems, heldCents } from '$lib/server/money/ledger';
import { withMail } from '$lib/server/mail/outbox';
import { getAdminQueueCounts } from '$lib/server/metrics';
import { stripe, transferGroupOf } from '$lib/server/money/stripe';
import { makeUser } from './matching-helpers';
import { paidBookingIn, startPaymentsWorld, type PaymentsWorld } from './payments-helpers';

let world: PaymentsWorld;
let adminId: string;
beforeAll(async () => {
	world = await startPaymentsWorld();
	adminId = await makeAdmin('dispute-admin');
});
afterAll(() => world.close());
afterEach(async () => {
	expect(await findLedgerProblems()).toEqual([]);
});

const HOUR = 3_600_000;

async function makeAdmin(label: string) {
	const made = await makeUser('owner', label);
	await db.update(user).set({ role: 'admin' }).where(eq(user.id, made.id));
	return made.id;
}

/** A paid booking whose fit was reported an hour ago (the owner's window is open). */
async function reportedBooking() {
	const made = await paidBookingIn(world);
	const reportedAt = new Date(Date.now() - HOUR);
	const opened = await withMail((tx, mail) =>
		openConfirmationWindow(tx, mail, made.bookingId, reportedAt)
	);
	if (!opened.ok) throw new Error(opened.message);
	const [row] = await db.select().from(booking).where(eq(booking.id, made.bookingId));
	return { ...made, total: row!.totalCents, confirmBy: row!.confirmBy! };
}

async function disputed() {
	const made = await reportedBooking();
	const opened = await openDispute({
		bookingId: made.bookingId,
		ownerId: made.ownerId,
		reason: 'parking-mode',
		description: 'The camera stops recording as soon as the ignition goes off.'
	});
	if (!opened.ok) throw new Error(opened.message);
	return { ...made, disputeId: opened.disputeId };
}

async function bookingRow(id: string) {
	const [row] = await db.select().from(booking).where(eq(booking.id, id));
	return row!;
}
async function disputeRow(id: string) {
	const [row] = await db.select().from(dispute).where(eq(dispute.id, id));
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
/** The booking's ledger lines of one kind, as (account, cents) pairs. */
async function ledgerOf(bookingId: string, kind: 'release' | 'refund') {
	return db
		.select({ account: ledgerEntry.account, amountCents: ledgerEntry.amountCents })
		.from(ledgerEntry)
		.innerJoin(ledgerTransaction, eq(ledgerTransaction.id, ledgerEntry.transactionId))
		.where(and(eq(ledgerTransaction.bookingId, bookingId), eq(ledgerTransaction.kind, kind)));
}
async function transfersOf(bookingId: string) {
	return (await stripe().transfers.list({ transfer_group: transferGroupOf(bookingId) })).data;
}
async function refundsOf(bookingId: string) {
	const [paid] = await db.select().from(payment).where(eq(payment.bookingId, bookingId));
	return (await stripe().refunds.list({ charge: paid!.chargeId! })).data;
}
async function auditsOf(disputeId: string) {
	const rows = await db.select().from(adminAudit).where(eq(adminAudit.action, 'dispute-settle'));
	return rows.filter((r) => r.after?.disputeId === disputeId);
}

describe('raising a problem', () => {
	it('is for the booking’s owner, inside the window, after the fit report', async () => {
		const made = await paidBookingIn(world);
		const early = await openDispute({
			bookingId: made.bookingId,
			ownerId: made.ownerId,
			reason: 'other',
			description: 'Nothing has been fitted yet at all.'
		});
		expect(early).toMatchObject({ ok: false, status: 409 });

		const reported = await reportedBooking();
		const ask = (ownerId: string, now = new Date()) =>
			openDispute(
				{
					bookingId: reported.bookingId,
					ownerId,
					reason: 'cable-visible',
					description: 'The power cable hangs below the A-pillar trim.'
				},
				now
			);
		const stranger = await makeUser('owner', 'stranger');
		expect(await ask(stranger.id)).toMatchObject({ ok: false, status: 404 });
		expect(await ask(reported.chosen.installerId)).toMatchObject({ ok: false, status: 404 });
		// At the deadline the window has closed (the lifecycle's "open" means strictly before).
		expect(await ask(reported.ownerId, reported.confirmBy)).toMatchObject({
			ok: false,
			status: 409
		});
		expect((await bookingRow(reported.bookingId)).stage).toBe('reported');

		const opened = await ask(reported.ownerId);
		expect(opened.ok).toBe(true);
		expect((await bookingRow(reported.bookingId)).stage).toBe('disputed');
		const row = await disputeRow(opened.ok ? opened.disputeId : '');
		expect(row).toMatchObject({
			status: 'open',
			heldCents: reported.total,
			reason: 'cable-visible'
		});
		expect(await mailsTo('dispute-opened', reported.chosen.installerId)).toHaveLength(1);
		// One open dispute per booking: a second ask finds the stage moved on.
		expect(await ask(reported.ownerId)).toMatchObject({ ok: false, status: 409 });
		expect(
			await db.select().from(dispute).where(eq(dispute.bookingId, reported.bookingId))
		).toHaveLength(1);
	});

	it('keeps the funds held: the window closing confirms nothing', async () => {
		const made = await disputed();
		const confirmed = await confirmOverdueWork(new Date(made.confirmBy.getTime() + HOUR));
		expect(confirmed).not.toContain(made.bookingId);
		expect((await bookingRow(made.bookingId)).stage).toBe('disputed');
		expect(await heldCents(db, made.bookingId)).toBe(made.total);
		expect(await transfersOf(made.bookingId)).toHaveLength(0);
	});
});

describe('the timeline', () => {
	it('takes the installer’s response and the owner’s evidence; both read the same lines', async () => {
		const made = await disputed();
		const installerId = made.chosen.installerId;
		const answered = await addDisputeEntry({
			bookingId: made.bookingId,
			userId: installerId,
			side: 'installer',
			body: 'Parking mode was tested on the day; the cut-off is set to 12.0 V.'
		});
		expect(answered.ok).toBe(true);
		expect(await mailsTo('dispute-added', made.ownerId)).toHaveLength(1);
		const more = await addDisputeEntry({
			bookingId: made.bookingId,
			userId: made.ownerId,
			side: 'owner',
			body: 'It still switches off after ten minutes parked.'
		});
		expect(more.ok).toBe(true);
		expect(
			await addAdminNote(made.disputeId, adminId, 'Asked both for a photo of the fuse box.')
		).toEqual({
			ok: true
		});
		const asOwner = await getDisputeForParty(made.bookingId, made.ownerId, 'owner');
		const asInstaller = await getDisputeForParty(made.bookingId, installerId, 'installer');
		const kinds = ['opened', 'installer_response', 'owner_evidence', 'admin_note'];
		expect(asOwner!.timeline.map((e) => e.kind)).toEqual(kinds);
		expect(asInstaller!.timeline.map((e) => e.id)).toEqual(asOwner!.timeline.map((e) => e.id));
		// Nobody else reads or writes it.
		const other = await makeUser('installer', 'other-installer');
		expect(await getDisputeForParty(made.bookingId, other.id, 'installer')).toBeNull();
		expect(
			await addDisputeEntry({
				bookingId: made.bookingId,
				userId: other.id,
				side: 'installer',
				body: 'Not my booking at all.'
			})
		).toMatchObject({ ok: false, status: 404 });
		const notes = await db.select().from(adminAudit).where(eq(adminAudit.action, 'dispute-note'));
		expect(notes.some((n) => n.after?.disputeId === made.disputeId)).toBe(true);
	});

	it('shows its photos to the two parties and admins only', async () => {
		const made = await reportedBooking();
		// Keys as the upload pipeline writes them; the rule under test reads only the rows.
		const opened = await openDispute({
			bookingId: made.bookingId,
			ownerId: made.ownerId,
			reason: 'vehicle-damage',
			description: 'A scratch on the dashboard where the cable was routed.',
			photos: [{ objectKey: 'disputes/x/a.jpg', thumbKey: 'disputes/x/a-thumb.jpg', bytes: 10 }]
		});
		expect(opened.ok).toBe(true);
		const party = await getDisputeForParty(made.bookingId, made.ownerId, 'owner');
		const photoId = party!.timeline[0]!.photoIds[0]!;
		const sees = async (id: string, role: string) =>
			(await findViewableDisputePhoto(photoId, { id, role })) !== null;
		expect(await sees(made.ownerId, 'owner')).toBe(true);
		expect(await sees(made.chosen.installerId, 'installer')).toBe(true);
		expect(await sees(adminId, 'admin')).toBe(true);
		const stranger = await makeUser('owner', 'photo-stranger');
		expect(await sees(stranger.id, 'owner')).toBe(false);
		const otherInstaller = await makeUser('installer', 'photo-installer');
		expect(await sees(otherInstaller.id, 'installer')).toBe(false);
	});

	it('shows open disputes oldest first with the count beside the navigation', async () => {
		const first = await disputed();
		const second = await disputed();
		const queue = await listDisputes('open');
		const ids = queue.rows.map((r) => r.id);
		expect(ids.indexOf(first.disputeId)).toBeLessThan(ids.indexOf(second.disputeId));
		expect((await getAdminQueueCounts()).disputes).toBe(queue.total);
	});
});

describe('settling', () => {
	it('releases in full: Tapline’s fee on the whole, one transfer, the funds no longer held', async () => {
		const made = await disputed();
		// The fixture's quote: $353.00. Fee 10 % = $35.30 (above the $15.00 minimum), GST on it
		// 3530 / 11 = 320.9… → $3.21 (ATO 1/11, half up); payout $353.00 − $35.30 = $317.70.
		expect(made.total).toBe(35_300);
		const fee = 3530;
		const gst = 321;
		const payout = 31_770;
		const settled = await settleDispute({
			disputeId: made.disputeId,
			adminId,
			outcome: 'release',
			note: 'The photos show parking mode working; the owner’s camera needs a firmware update.'
		});
		expect(settled).toMatchObject({ ok: true, refundCents: 0, payoutCents: payout, feeCents: fee });
		expect(await disputeRow(made.disputeId)).toMatchObject({
			status: 'settled',
			outcome: 'release',
			refundCents: 0,
			payoutCents: payout,
			feeCents: fee,
			settledBy: adminId
		});
		expect(await bookingRow(made.bookingId)).toMatchObject({
			stage: 'settled',
			acceptedBy: 'settlement'
		});
		expect(await heldCents(db, made.bookingId)).toBe(0);
		expect(await ledgerOf(made.bookingId, 'release')).toEqual(
			expect.arrayContaining([
				{ account: 'owner_funds_held', amountCents: made.total },
				{ account: 'fee_revenue', amountCents: -(fee - gst) },
				{ account: 'gst_payable', amountCents: -gst },
				{ account: 'platform_cash', amountCents: -payout }
			])
		);
		expect(await ledgerOf(made.bookingId, 'refund')).toEqual([]);
		expect((await transfersOf(made.bookingId)).map((t) => t.amount)).toEqual([payout]);
		expect(await refundsOf(made.bookingId)).toHaveLength(0);
		expect(await mailsTo('dispute-settled', made.ownerId)).toHaveLength(1);
		expect(await mailsTo('dispute-settled', made.chosen.installerId)).toHaveLength(1);
		const audits = await auditsOf(made.disputeId);
		expect(audits.map((a) => a.targetUserId).sort()).toEqual(
			[made.ownerId, made.chosen.installerId].sort()
		);
		expect(audits[0]).toMatchObject({ actorId: adminId, before: { status: 'open' } });
	});

	it('refunds a stated part and releases the rest with the fee on the remainder only', async () => {
		const made = await disputed();
		// $353.00 held, $50.00 back to the owner: $303.00 released. The fee is 10 % of the released
		// $303.00 = $30.30 (not $35.30 on the whole); the installer gets $272.70.
		expect(made.total).toBe(35_300);
		const refund = 5000;
		const remainder = 30_300;
		const fee = 3030;
		const payout = 27_270;
		const settled = await settleDispute({
			disputeId: made.disputeId,
			adminId,
			outcome: 'partial_refund',
			refundCents: refund,
			note: 'The trim clip was broken during the fit; $50.00 covers a new one.'
		});
		expect(settled).toMatchObject({
			ok: true,
			refundCents: refund,
			payoutCents: payout,
			feeCents: fee
		});
		expect(await ledgerOf(made.bookingId, 'refund')).toEqual(
			expect.arrayContaining([
				{ account: 'owner_funds_held', amountCents: refund },
				{ account: 'platform_cash', amountCents: -refund }
			])
		);
		// GST on the $30.30 fee: 3030 / 11 = 275.45… → $2.75 (ATO 1/11, half up).
		expect(await ledgerOf(made.bookingId, 'release')).toEqual(
			expect.arrayContaining([
				{ account: 'owner_funds_held', amountCents: remainder },
				{ account: 'fee_revenue', amountCents: -(fee - 275) },
				{ account: 'gst_payable', amountCents: -275 },
				{ account: 'platform_cash', amountCents: -payout }
			])
		);
		expect(await heldCents(db, made.bookingId)).toBe(0);
		expect((await transfersOf(made.bookingId)).map((t) => t.amount)).toEqual([payout]);
		expect((await refundsOf(made.bookingId)).map((r) => r.amount)).toEqual([refund]);
		const [paid] = await db.select().from(payment).where(eq(payment.bookingId, made.bookingId));
		expect(paid).toMatchObject({ payoutCents: payout, feeCents: fee });
		expect(paid!.releasedAt).toBeInstanceOf(Date);
	});

	it('refunds in full: everything back, no transfer, no fee', async () => {
		const made = await disputed();
		const settled = await settleDispute({
			disputeId: made.disputeId,
			adminId,
			outcome: 'full_refund',
			note: 'The camera was fitted inside the airbag deployment path; the owner is refunded.'
		});
		expect(settled).toMatchObject({
			ok: true,
			refundCents: made.total,
			payoutCents: 0,
			feeCents: 0
		});
		expect(await ledgerOf(made.bookingId, 'refund')).toEqual(
			expect.arrayContaining([{ account: 'owner_funds_held', amountCents: made.total }])
		);
		expect(await ledgerOf(made.bookingId, 'release')).toEqual([]);
		expect(await transfersOf(made.bookingId)).toHaveLength(0);
		expect((await refundsOf(made.bookingId)).map((r) => r.amount)).toEqual([made.total]);
		expect(await heldCents(db, made.bookingId)).toBe(0);
		expect((await bookingRow(made.bookingId)).stage).toBe('settled');
	});

	it('sends the installer back on a new date: funds stay held, a new report opens a new window', async () => {
		const made = await disputed();
		const start = new Date(Date.now() + 5 * 24 * HOUR);
		const end = new Date(start.getTime() + 2 * HOUR);
		const settled = await settleDispute({
			disputeId: made.disputeId,
			adminId,
			outcome: 'return_visit',
			visit: { start, end },
			note: 'The installer will re-route the cable and re-test parking mode.'
		});
		expect(settled).toMatchObject({ ok: true, refundCents: 0, payoutCents: 0 });
		const row = await bookingRow(made.bookingId);
		expect(row).toMatchObject({ stage: 'to_fit', confirmBy: null });
		expect(row.slotStart.getTime()).toBe(start.getTime());
		expect(row.slotEnd.getTime()).toBe(end.getTime());
		expect(await heldCents(db, made.bookingId)).toBe(made.total);
		expect(await transfersOf(made.bookingId)).toHaveLength(0);
		expect(await disputeRow(made.disputeId)).toMatchObject({
			status: 'settled',
			outcome: 'return_visit'
		});
		// The return visit's report opens a new window, and a new problem is a new dispute.
		const reopened = await withMail((tx, mail) => openConfirmationWindow(tx, mail, made.bookingId));
		expect(reopened.ok).toBe(true);
		const again = await openDispute({
			bookingId: made.bookingId,
			ownerId: made.ownerId,
			reason: 'parking-mode',
			description: 'Still switches off after ten minutes parked.'
		});
		expect(again.ok).toBe(true);
		expect(await disputeRow(made.disputeId)).toMatchObject({ status: 'settled' });
	});

	it('refuses a return visit in the past or with no time', async () => {
		const made = await disputed();
		const past = new Date(Date.now() - HOUR);
		expect(
			await settleDispute({
				disputeId: made.disputeId,
				adminId,
				outcome: 'return_visit',
				visit: { start: past, end: new Date(past.getTime() + HOUR) },
				note: 'Back in time.'
			})
		).toMatchObject({ ok: false, status: 400 });
		expect((await bookingRow(made.bookingId)).stage).toBe('disputed');
	});

	it('never reopens a settled dispute (409)', async () => {
		const made = await disputed();
		const settle = () =>
			settleDispute({
				disputeId: made.disputeId,
				adminId,
				outcome: 'release',
				note: 'Work stands.'
			});
		expect((await settle()).ok).toBe(true);
		expect(await settle()).toMatchObject({ ok: false, status: 409 });
		expect(
			await settleDispute({
				disputeId: made.disputeId,
				adminId,
				outcome: 'full_refund',
				note: 'Changed my mind.'
			})
		).toMatchObject({ ok: false, status: 409 });
		expect(
			await openDispute({
				bookingId: made.bookingId,
				ownerId: made.ownerId,
				reason: 'other',
				description: 'I want to raise it again please.'
			})
		).toMatchObject({ ok: false, status: 409 });
		expect(
			await addDisputeEntry({
				bookingId: made.bookingId,
				userId: made.ownerId,
				side: 'owner',
				body: 'One more thing to add.'
			})
		).toMatchObject({ ok: false, status: 409 });
		expect(await addAdminNote(made.disputeId, adminId, 'A late note.')).toMatchObject({
			ok: false,
			status: 409
		});
		expect(await transfersOf(made.bookingId)).toHaveLength(1);
	});

	it('refuses an admin who is party to the booking (403), and anyone not an admin', async () => {
		const made = await disputed();
		// The booking's owner later became an admin: still party to it.
		await db.update(user).set({ role: 'admin' }).where(eq(user.id, made.ownerId));
		const asParty = await settleDispute({
			disputeId: made.disputeId,
			adminId: made.ownerId,
			outcome: 'full_refund',
			note: 'Refunding myself.'
		});
		expect(asParty).toMatchObject({ ok: false, status: 403 });
		const asInstaller = await settleDispute({
			disputeId: made.disputeId,
			adminId: made.chosen.installerId,
			outcome: 'release',
			note: 'Paying myself.'
		});
		expect(asInstaller).toMatchObject({ ok: false, status: 403 });
		expect(await disputeRow(made.disputeId)).toMatchObject({ status: 'open', settledAt: null });
		expect(await auditsOf(made.disputeId)).toHaveLength(0);
		expect(await refundsOf(made.bookingId)).toHaveLength(0);
	});

	it('takes a partial refund only above $0 and below what is held (400 with a message)', async () => {
		const made = await disputed();
		for (const refundCents of [0, -1, made.total, made.total + 1]) {
			const refused = await settleDispute({
				disputeId: made.disputeId,
				adminId,
				outcome: 'partial_refund',
				refundCents,
				note: 'Trying the bounds.'
			});
			expect(refused).toMatchObject({ ok: false, status: 400 });
			expect(!refused.ok && refused.message.length).toBeGreaterThan(10);
		}
		expect(await disputeRow(made.disputeId)).toMatchObject({ status: 'open' });
		expect(await refundsOf(made.bookingId)).toHaveLength(0);
	});

	it('writes nothing when the provider is down (503), and a retry settles once', async () => {
		const made = await disputed();
		const mailsBefore = (await mailsTo('dispute-settled', made.ownerId)).length;
		// The SDK tries twice (maxNetworkRetries 1): both attempts fail.
		await world.control('/fail-next', { count: 2, status: 500 });
		let down;
		try {
			down = await settleDispute({
				disputeId: made.disputeId,
				adminId,
				outcome: 'partial_refund',
				refundCents: 5000,
				note: 'Half-way through, the provider fell over.'
			});
		} finally {
			await world.control('/fail-next', { count: 0 });
		}
		expect(down).toMatchObject({ ok: false, status: 503 });
		expect(await disputeRow(made.disputeId)).toMatchObject({ status: 'open', outcome: null });
		expect((await bookingRow(made.bookingId)).stage).toBe('disputed');
		expect(await ledgerOf(made.bookingId, 'release')).toEqual([]);
		expect(await ledgerOf(made.bookingId, 'refund')).toEqual([]);
		expect(await heldCents(db, made.bookingId)).toBe(made.total);
		expect(await transfersOf(made.bookingId)).toHaveLength(0);
		expect(await refundsOf(made.bookingId)).toHaveLength(0);
		expect((await mailsTo('dispute-settled', made.ownerId)).length).toBe(mailsBefore);
		expect(await auditsOf(made.disputeId)).toHaveLength(0);
		const events = await db
			.select()
			.from(disputeEvent)
			.where(and(eq(disputeEvent.disputeId, made.disputeId), eq(disputeEvent.kind, 'settlement')));
		expect(events).toHaveLength(0);

		const retried = await settleDispute({
			disputeId: made.disputeId,
			adminId,
			outcome: 'partial_refund',
			refundCents: 5000,
			note: 'Settled on the second try.'
		});
		expect(retried.ok).toBe(true);
		expect(await transfersOf(made.bookingId)).toHaveLength(1);
		expect((await refundsOf(made.bookingId)).map((r) => r.amount)).toEqual([5000]);
	});
});

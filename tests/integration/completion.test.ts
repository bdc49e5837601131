// Finishing a paid booking: the fit report opens the owner's window, the owner confirms or the
// window closes, and the held funds are released once. Rules: the lifecycle issue (Tapline's own).
import { and, eq } from 'drizzle-orm';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import {
	confirmOverdueWork,
	confirmWork,
	openConfirmationWindow
} from '$lib/server/work/completion';
import { db } from '$lib/server/db';
import { booking, emailOutbox, ledgerTransaction, payment } from '$lib/server/db/schema';
import { findLedgerProblems } from '$lib/server/money/ledger';
import { withMail } from '$lib/server/mail/outbox';
import { cancelPaidBooking, retryPendingReleases } from '$lib/server/money/payments';
import { defaultMarketSettings, updateMarketSettings } from '$lib/server/money/settings';
import { stripe, transferGroupOf } from '$lib/server/money/stripe';
import { makeUser } from './matching-helpers';
import { paidBookingIn, startPaymentsWorld, type PaymentsWorld } from './payments-helpers';

let world: PaymentsWorld;
beforeAll(async () => {
	world = await startPaymentsWorld();
});
afterAll(() => world.close());
afterEach(async () => {
	expect(await findLedgerProblems()).toEqual([]);
});

const HOUR = 3_600_000;

async function bookingRow(id: string) {
	const [row] = await db.select().from(booking).where(eq(booking.id, id));
	return row!;
}
async function releases(bookingId: string) {
	return db
		.select()
		.from(ledgerTransaction)
		.where(and(eq(ledgerTransaction.bookingId, bookingId), eq(ledgerTransaction.kind, 'release')));
}
async function mailsTo(template: string, to: string) {
	return db
		.select()
		.from(emailOutbox)
		.where(and(eq(emailOutbox.template, template), eq(emailOutbox.toAddress, to)));
}
async function report(bookingId: string, now: Date) {
	return withMail((tx, mail) => openConfirmationWindow(tx, mail, bookingId, now));
}
async function transfersOf(bookingId: string) {
	return (await stripe().transfers.list({ transfer_group: transferGroupOf(bookingId) })).data;
}

describe('the confirmation window', () => {
	it('opens on the fit report for the configured 72 hours and tells the owner', async () => {
		const made = await paidBookingIn(world);
		const at = new Date();
		const opened = await report(made.bookingId, at);
		expect(opened.ok).toBe(true);
		const row = await bookingRow(made.bookingId);
		expect(row.stage).toBe('reported');
		expect(row.reportedAt?.getTime()).toBe(at.getTime());
		// 72 h: the lifecycle issue's default window.
		expect(row.confirmBy!.getTime() - at.getTime()).toBe(72 * HOUR);
		const [owner] = await db.query.user.findMany({ where: (u, { eq }) => eq(u.id, made.ownerId) });
		expect(await mailsTo('fit-reported-owner', owner!.email)).toHaveLength(1);
		// A second report is refused: the stage has moved on.
		const again = await report(made.bookingId, at);
		expect(again).toMatchObject({ ok: false, status: 409 });
	});

	it('uses the window an admin set', async () => {
		const admin = await makeUser('owner', 'settings-admin');
		const before = defaultMarketSettings();
		await updateMarketSettings(
			admin.id,
			{ ...before, confirmationWindowHours: 48 },
			'Shorter test'
		);
		try {
			const made = await paidBookingIn(world);
			const at = new Date();
			await report(made.bookingId, at);
			expect((await bookingRow(made.bookingId)).confirmBy!.getTime() - at.getTime()).toBe(
				48 * HOUR
			);
		} finally {
			await updateMarketSettings(admin.id, before, 'Back to the default');
		}
	});

	it('refuses a report for a booking that is not paid', async () => {
		const { bookAndOpenCheckout } = await import('./payments-helpers');
		const made = await bookAndOpenCheckout();
		expect(await report(made.bookingId, new Date())).toMatchObject({ ok: false, status: 409 });
		expect((await bookingRow(made.bookingId)).stage).toBe('to_fit');
	});
});

describe('the owner confirming', () => {
	it('accepts the work and releases the held funds once', async () => {
		const made = await paidBookingIn(world);
		const at = new Date();
		await report(made.bookingId, at);
		const [first, second] = await Promise.all([
			confirmWork(made.bookingId, made.ownerId, new Date(at.getTime() + HOUR)),
			confirmWork(made.bookingId, made.ownerId, new Date(at.getTime() + HOUR))
		]);
		expect([first.ok, second.ok].sort()).toEqual([false, true]);
		const done = first.ok ? first : second;
		expect(done.ok && done.release.ok).toBe(true);
		const row = await bookingRow(made.bookingId);
		expect(row).toMatchObject({ stage: 'accepted', acceptedBy: 'owner' });
		expect(await releases(made.bookingId)).toHaveLength(1);
		expect(await transfersOf(made.bookingId)).toHaveLength(1);
	});

	it('refuses another owner, and the owner after the window closed', async () => {
		const made = await paidBookingIn(world);
		const at = new Date();
		await report(made.bookingId, at);
		const stranger = await makeUser('owner', 'stranger');
		expect(await confirmWork(made.bookingId, stranger.id, at)).toMatchObject({
			ok: false,
			status: 404
		});
		const late = await confirmWork(
			made.bookingId,
			made.ownerId,
			new Date(at.getTime() + 72 * HOUR)
		);
		expect(late).toMatchObject({ ok: false, status: 409 });
		expect((await bookingRow(made.bookingId)).stage).toBe('reported');
		expect(await releases(made.bookingId)).toHaveLength(0);
	});

	it('refuses to confirm before the fit is reported, and refuses cancelling after it', async () => {
		const made = await paidBookingIn(world);
		expect(await confirmWork(made.bookingId, made.ownerId)).toMatchObject({
			ok: false,
			status: 409
		});
		await report(made.bookingId, new Date());
		const cancel = await cancelPaidBooking(made.bookingId, 'owner', made.ownerId);
		expect(cancel).toMatchObject({ ok: false, status: 409 });
		expect((await bookingRow(made.bookingId)).status).toBe('confirmed');
	});
});

describe('the window closing (booking-auto-confirm)', () => {
	it('confirms nothing before the deadline, then confirms and releases exactly once with two workers', async () => {
		const made = await paidBookingIn(world);
		const at = new Date(Date.now() - 100 * HOUR);
		await report(made.bookingId, at);
		const deadline = (await bookingRow(made.bookingId)).confirmBy!;
		expect(await confirmOverdueWork(new Date(deadline.getTime() - 1))).not.toContain(
			made.bookingId
		);
		const [a, b] = await Promise.all([confirmOverdueWork(deadline), confirmOverdueWork(deadline)]);
		expect([...a, ...b].filter((id) => id === made.bookingId)).toHaveLength(1);
		expect(await bookingRow(made.bookingId)).toMatchObject({
			stage: 'accepted',
			acceptedBy: 'window'
		});
		expect(await releases(made.bookingId)).toHaveLength(1);
		expect(await transfersOf(made.bookingId)).toHaveLength(1);
		const [owner] = await db.query.user.findMany({ where: (u, { eq }) => eq(u.id, made.ownerId) });
		expect(await mailsTo('work-confirmed', owner!.email)).toHaveLength(1);
		// A later run finds nothing left to do.
		expect(await confirmOverdueWork(new Date(deadline.getTime() + HOUR))).not.toContain(
			made.bookingId
		);
	});

	it('keeps the release asked for when the provider is down, and the retry pays once', async () => {
		const made = await paidBookingIn(world);
		await report(made.bookingId, new Date(Date.now() - 73 * HOUR));
		await world.control('/fail-next', { count: 3, status: 500 });
		try {
			expect(await confirmOverdueWork()).toContain(made.bookingId);
		} finally {
			await world.control('/fail-next', { count: 0 });
		}
		const [paid] = await db.select().from(payment).where(eq(payment.bookingId, made.bookingId));
		expect(paid!.releaseRequestedAt).toBeInstanceOf(Date);
		expect(paid!.releasedAt).toBeNull();
		expect((await bookingRow(made.bookingId)).stage).toBe('accepted');
		await retryPendingReleases();
		expect(await releases(made.bookingId)).toHaveLength(1);
		expect(await transfersOf(made.bookingId)).toHaveLength(1);
	});
});

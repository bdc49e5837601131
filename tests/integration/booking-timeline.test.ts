import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { getBookingTimeline } from '$lib/server/marketplace/admin-bookings';
import { db } from '$lib/server/db';
import { fitReport, jobMessage } from '$lib/server/db/schema';
import { confirmWork, openConfirmationWindow } from '$lib/server/work/completion';
import { withMail } from '$lib/server/mail/outbox';
import { releaseHeldFunds } from '$lib/server/money/payments';
import { postJobMessage } from '$lib/server/marketplace/threads';
import {
	bookAndOpenCheckout,
	onboardInstaller,
	paidBookingIn,
	payWith,
	startPaymentsWorld,
	type PaymentsWorld
} from './payments-helpers';

let world: PaymentsWorld;

beforeAll(async () => {
	world = await startPaymentsWorld();
});
afterAll(() => world.close());

describe('the admin booking timeline', () => {
	it('merges the booking, its payment, its ledger and the thread with its installer in time order', async () => {
		const made = await bookAndOpenCheckout(2);
		const installerId = made.chosen.installerId;
		await onboardInstaller(installerId);
		const asked = await postJobMessage(
			made.job.id,
			installerId,
			{ id: made.ownerId, role: 'owner' },
			'Can you park in the drive? Call me on 0412 345 678'
		);
		expect(asked.ok).toBe(true);
		// A message in the other installer's thread about the same job is not this booking's.
		const other = made.installers.find((i) => i.id !== installerId)!;
		await db.insert(jobMessage).values({
			jobId: made.job.id,
			installerId: other.id,
			authorId: other.id,
			body: 'Not about this booking'
		});
		await payWith(world, made.sessionId, '4242424242424242');
		const released = await releaseHeldFunds(made.bookingId);
		expect(released.ok).toBe(true);

		const found = await getBookingTimeline(made.bookingId);
		expect(found).not.toBeNull();
		const { booking, entries } = found!;
		expect(booking).toMatchObject({
			id: made.bookingId,
			jobId: made.job.id,
			ownerId: made.ownerId,
			installerId,
			status: 'confirmed',
			totalCents: made.chosen.totalCents
		});

		// Oldest first, and every entry once.
		const times = entries.map((e) => e.at.getTime());
		expect(times).toEqual([...times].sort((a, b) => a - b));
		expect(new Set(entries.map((e) => e.key)).size).toBe(entries.length);
		const keys = entries
			.filter((e) => e.kind !== 'provider-event')
			.map((e) => (e.kind === 'ledger' ? `ledger:${e.transactionKind}` : e.key));
		const messageKey = keys.find((k) => k.startsWith('message:'))!;
		expect([...keys].sort()).toEqual(
			[
				'booked',
				'checkout-opened',
				messageKey,
				'paid',
				'ledger:payment',
				'release-requested',
				'released',
				'ledger:release',
				'hold-ends'
			].sort()
		);
		// The order that can be known from the steps themselves: each happened after the one before.
		const before = (a: string, b: string) => expect(keys.indexOf(a)).toBeLessThan(keys.indexOf(b));
		before('booked', 'checkout-opened');
		before('checkout-opened', messageKey);
		before(messageKey, 'paid');
		before(messageKey, 'ledger:payment');
		before('ledger:payment', 'ledger:release');
		before('paid', 'release-requested');
		before('release-requested', 'released');

		// The provider's events about this booking, recorded as the webhook took them: the
		// payment's among them, after the message and before the release was asked for.
		const events = entries.flatMap((e, i) => (e.kind === 'provider-event' ? [{ ...e, i }] : []));
		const paidEvent = events.find((e) => e.type === 'checkout.session.completed');
		expect(paidEvent, JSON.stringify(events.map((e) => e.type))).toBeTruthy();
		const at = (key: string) => entries.findIndex((e) => e.key === key);
		expect(paidEvent!.i).toBeGreaterThan(at(messageKey));
		expect(paidEvent!.i).toBeLessThan(at('release-requested'));

		const message = entries.find((e) => e.kind === 'message')!;
		expect(message).toMatchObject({ from: 'owner', authorName: expect.any(String) });
		// Shown as stored: the phone number was hidden when it was written, before payment.
		if (message.kind !== 'message') throw new Error('not a message');
		expect(message.body).not.toContain('0412 345 678');
		expect(message.masked.length).toBeGreaterThan(0);

		const payment = entries.find((e) => e.kind === 'ledger' && e.transactionKind === 'payment');
		if (payment?.kind !== 'ledger') throw new Error('no payment in the ledger');
		expect(payment.entries).toEqual([
			{ account: 'platform_cash', amountCents: made.chosen.totalCents },
			{ account: 'owner_funds_held', amountCents: -made.chosen.totalCents }
		]);
		const release = entries.find((e) => e.kind === 'ledger' && e.transactionKind === 'release');
		if (release?.kind !== 'ledger') throw new Error('no release in the ledger');
		expect(release.entries.reduce((sum, e) => sum + e.amountCents, 0)).toBe(0);
		expect(release.entries.some((e) => e.account === 'installer_payable')).toBe(true);
	});

	it('shows the work: the fit report filed, then the owner confirming it', async () => {
		const made = await paidBookingIn(world);
		const filedAt = new Date();
		await withMail(async (tx, mail) => {
			const opened = await openConfirmationWindow(tx, mail, made.bookingId, filedAt);
			if (!opened.ok) throw new Error(opened.message);
			await tx.insert(fitReport).values({
				bookingId: made.bookingId,
				installerId: made.chosen.installerId,
				minutesTaken: 90,
				details: {},
				filedAt
			});
		});
		const confirmed = await confirmWork(made.bookingId, made.ownerId);
		expect(confirmed.ok).toBe(true);
		const timeline = await getBookingTimeline(made.bookingId);
		const work = timeline!.entries.filter((e) => e.kind === 'work');
		expect(work.map((e) => (e.kind === 'work' ? e.title : ''))).toEqual([
			'Fit report filed (visit 1)',
			'Work confirmed by the owner'
		]);
		// In time order with the rest: the release's ledger lines come after the confirmation.
		const keys = timeline!.entries.map((e) => e.key);
		const release = timeline!.entries.find(
			(e) => e.kind === 'ledger' && e.transactionKind === 'release'
		);
		expect(keys.indexOf('accepted')).toBeLessThan(keys.indexOf(release!.key));
	});

	it('is null for a booking that does not exist', async () => {
		expect(await getBookingTimeline(randomUUID())).toBeNull();
	});
});

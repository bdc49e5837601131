// The demo, loaded as npm start loads it, checked against the product's own rules: every
// booking's stage is reached by the lifecycle's moves at the times recorded, the ledger balances
// and equals the payments fake's balance, every installer who quoted was vetted by then, every
// review belongs to finished work inside its window, and no date lies where the product would
// have refused it. (The vetting documents and hours are checked in seed-vetting-rules.test.ts.)
import { and, eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { nextStage, type FitMove, type FitStageName } from '$lib/work/lifecycle';
import { reviewWindowCloses } from '$lib/work/reviews';
import { isWithinWorkingHours } from '$lib/work/schedule';
import { db } from '$lib/server/db';
import {
	booking,
	dispute,
	fitReport,
	installerProfile,
	ledgerEntry,
	payment,
	quote,
	review,
	user,
	vettingEvent
} from '$lib/server/db/schema';
import { getWeeklyHours } from '$lib/server/work/diary';
import { demoTourIfLoaded } from '$lib/server/demo-tour';
import { findLedgerProblems } from '$lib/server/money/ledger';
import { reconcileWithProvider } from '$lib/server/money/receipts';
import { seedDemo } from '../../seed';
import { startDemoWorld } from './demo-world';

let stop: () => Promise<void>;
let seededAt: Date;
beforeAll(async () => {
	stop = await startDemoWorld();
	seededAt = new Date();
	expect(await seedDemo(process.env.DATABASE_URL as string)).toBe(true);
});
afterAll(() => stop());

const ZONE = 'Australia/Adelaide';

describe('the demo obeys the product’s rules', () => {
	it('shows every stage of a booking', async () => {
		const rows = await db
			.select({ status: booking.status, stage: booking.stage, ownerEmail: user.email })
			.from(booking)
			.innerJoin(user, eq(user.id, booking.ownerId));
		const mine = rows.filter((r) => r.ownerEmail === 'demo.owner@tapline.test');
		const seen = new Set(mine.map((r) => `${r.status}/${r.stage}`));
		for (const state of [
			'awaiting_payment/to_fit',
			'confirmed/to_fit',
			'confirmed/reported',
			'confirmed/accepted',
			'confirmed/disputed',
			'cancelled/to_fit'
		])
			expect(seen, state).toContain(state);
	});

	it('has the accounts the first screen points to', async () => {
		expect(await demoTourIfLoaded()).not.toBeNull();
	});

	it('reaches every booking’s stage by the lifecycle’s moves at the recorded times', async () => {
		const rows = await db
			.select({ booking, paidAt: payment.paidAt })
			.from(booking)
			.leftJoin(payment, eq(payment.bookingId, booking.id));
		expect(rows.length).toBeGreaterThan(15);
		for (const { booking: b, paidAt } of rows) {
			const [report] = await db
				.select()
				.from(fitReport)
				.where(and(eq(fitReport.bookingId, b.id), eq(fitReport.visit, 1)));
			const [opened] = await db.select().from(dispute).where(eq(dispute.bookingId, b.id));
			// The moves the records say happened, in order, each asked of the lifecycle table.
			const moves: Array<[FitMove, 'owner' | 'installer' | 'schedule' | 'admin', Date]> = [];
			if (report) moves.push(['file-report', 'installer', report.filedAt]);
			if (opened) moves.push(['raise-problem', 'owner', opened.openedAt]);
			if (b.acceptedAt)
				moves.push([
					b.acceptedBy === 'owner' ? 'confirm' : 'window-closes',
					b.acceptedBy === 'owner' ? 'owner' : 'schedule',
					b.acceptedAt
				]);
			let stage: FitStageName = 'to_fit';
			for (const [move, actor, at] of moves) {
				const check = nextStage(stage, move, actor, at, b.confirmBy);
				expect(check, `${b.id}: ${move} from ${stage}`).toMatchObject({ ok: true });
				if (check.ok) stage = check.to;
			}
			expect(stage, b.id).toBe(b.stage);
			// Work moves on only once paid; an unpaid booking is one waiting in its hold.
			if (b.stage !== 'to_fit') expect(paidAt, b.id).not.toBeNull();
			if (b.status === 'awaiting_payment') {
				expect(paidAt).toBeNull();
				expect(b.holdExpiresAt.getTime()).toBeGreaterThan(seededAt.getTime());
			}
			if (paidAt) expect(paidAt.getTime()).toBeLessThan(b.holdExpiresAt.getTime());
		}
	});

	it('balances the ledger, and its cash equals the payments fake’s balance', async () => {
		expect(await findLedgerProblems()).toEqual([]);
		const [sum] = await db
			.select({ total: sql<string>`coalesce(sum(${ledgerEntry.amountCents}), 0)` })
			.from(ledgerEntry);
		expect(Number(sum?.total)).toBe(0);
		const reconciliation = await reconcileWithProvider();
		expect(reconciliation.ledgerCashCents).toBeGreaterThan(0);
		expect(reconciliation.driftCents).toBe(0);
		// Backdated through the domain functions' clock: each payment's ledger posting carries the
		// time the payment was recorded, not the time the seed ran.
		const drift = await db.execute(sql`
			SELECT p.booking_id FROM payment p
			JOIN ledger_transaction t ON t.booking_id = p.booking_id AND t.kind = 'payment'
			WHERE t.created_at <> p.paid_at`);
		expect(drift.rows).toEqual([]);
		// Released, refunded and a late fee paid: money moved every way the product moves it.
		const kinds = await db.execute<{ kind: string }>(
			sql`SELECT DISTINCT kind FROM ledger_transaction ORDER BY kind`
		);
		expect(kinds.rows.map((r) => r.kind)).toEqual(
			expect.arrayContaining(['late_fee', 'payment', 'refund', 'release'])
		);
	});

	it('has only vetted installers quoting, each approved before their first quote', async () => {
		const quoted = await db
			.select({
				installerId: quote.installerId,
				first: sql<Date>`min(${quote.createdAt})`.mapWith((v: string) => new Date(v)),
				status: installerProfile.vettingStatus,
				payouts: installerProfile.payoutsEnabled
			})
			.from(quote)
			.innerJoin(installerProfile, eq(installerProfile.userId, quote.installerId))
			.groupBy(quote.installerId, installerProfile.vettingStatus, installerProfile.payoutsEnabled);
		expect(quoted.length).toBeGreaterThan(2);
		for (const q of quoted) {
			expect(q.status).toBe('approved');
			expect(q.payouts).toBe(true);
			const [approved] = await db
				.select({ at: vettingEvent.createdAt })
				.from(vettingEvent)
				.where(
					and(eq(vettingEvent.installerId, q.installerId), eq(vettingEvent.toStatus, 'approved'))
				);
			expect(approved?.at.getTime()).toBeLessThan(q.first.getTime());
		}
	});

	it('has every review on finished work, written inside its window', async () => {
		const rows = await db
			.select({ review, stage: booking.stage, acceptedAt: booking.acceptedAt })
			.from(review)
			.innerJoin(booking, eq(booking.id, review.bookingId));
		expect(rows.length).toBeGreaterThan(10);
		for (const { review: r, stage, acceptedAt } of rows) {
			expect(['accepted', 'settled']).toContain(stage);
			expect(acceptedAt).not.toBeNull();
			if (!acceptedAt) continue;
			expect(r.createdAt.getTime()).toBeGreaterThanOrEqual(acceptedAt.getTime());
			expect(r.createdAt.getTime()).toBeLessThan(reviewWindowCloses(acceptedAt).getTime());
		}
	});

	it('puts no date where the product would refuse it', async () => {
		const rows = await db
			.select({ booking, quotedAt: quote.createdAt })
			.from(booking)
			.innerJoin(quote, eq(quote.id, booking.quoteId));
		for (const { booking: b, quotedAt } of rows) {
			// Booked inside the installer's working hours, offered before the slot, booked after
			// the quote and before the slot; nothing recorded in the future.
			const hours = await getWeeklyHours(b.installerId);
			expect(
				isWithinWorkingHours({ start: b.slotStart, end: b.slotEnd }, hours, [], ZONE),
				`${b.id} in working hours`
			).toBe(true);
			expect(quotedAt.getTime()).toBeLessThan(b.slotStart.getTime());
			expect(b.createdAt.getTime()).toBeGreaterThanOrEqual(quotedAt.getTime());
			expect(b.createdAt.getTime()).toBeLessThan(b.slotStart.getTime());
			expect(b.createdAt.getTime()).toBeLessThanOrEqual(Date.now());
			// A fit is reported after it happened, and a problem is raised while the window is open.
			if (b.reportedAt) {
				expect(b.reportedAt.getTime()).toBeGreaterThan(b.slotEnd.getTime());
				expect(b.reportedAt.getTime()).toBeLessThanOrEqual(Date.now());
			}
			if (b.stage === 'reported' || b.stage === 'disputed')
				expect(b.confirmBy?.getTime()).toBeGreaterThan(seededAt.getTime());
		}
		// No two live bookings of one installer overlap.
		const clashes = await db.execute(sql`
			SELECT a.id FROM booking a JOIN booking b
				ON a.installer_id = b.installer_id AND a.id < b.id
				AND a.status IN ('confirmed', 'awaiting_payment') AND b.status IN ('confirmed', 'awaiting_payment')
				AND a.slot_start < b.slot_end AND b.slot_start < a.slot_end`);
		expect(clashes.rows).toEqual([]);
	});
});

// Fault drill (issue 17): the app process killed in the middle of a release or a refund. A child
// process makes the call against this file's database and the payments fake; the fake does the
// work but holds its answer, and the child is killed (SIGKILL, no clean-up) while it waits, so its
// transaction never commits although the provider has moved the money. What runs afterwards (the
// release schedule, the provider's webhook, an admin's retry) must complete it exactly once.
import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { and, eq } from 'drizzle-orm';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { ledgerTransaction, payment } from '$lib/server/db/schema';
import { findLedgerProblems, heldCents } from '$lib/server/money/ledger';
import { refundHeldFunds, retryPendingReleases } from '$lib/server/money/payments';
import { reconcileWithProvider } from '$lib/server/money/receipts';
import { stripe, transferGroupOf } from '$lib/server/money/stripe';
import { paidBookingIn, startPaymentsWorld, type PaymentsWorld } from './payments-helpers';

let world: PaymentsWorld;
beforeAll(async () => {
	world = await startPaymentsWorld();
});
afterAll(() => world.close());
afterEach(async () => {
	expect(await findLedgerProblems()).toEqual([]);
	expect((await reconcileWithProvider()).driftCents).toBe(0);
});

/** Long enough that the answer never arrives before the kill; the fake releases it on close. */
const HELD_ANSWER_MS = 120_000;

function startMoneyCall(args: string[]): { child: ChildProcess; output: () => string } {
	let output = '';
	const child = spawn(
		process.execPath,
		['--import', 'tsx', path.resolve('tests/integration/drills-support/money-call.ts'), ...args],
		{
			env: {
				...process.env,
				TSX_TSCONFIG_PATH: path.resolve('tests/integration/drills-support/tsconfig.json')
			},
			stdio: ['ignore', 'pipe', 'pipe']
		}
	);
	child.stdout?.on('data', (c: Buffer) => (output += c.toString()));
	child.stderr?.on('data', (c: Buffer) => (output += c.toString()));
	return { child, output: () => output };
}

/** Polls `found` every 100 ms until it is true, up to a deadline. */
async function waitFor(what: string, found: () => Promise<boolean>, deadlineMs = 30_000) {
	const deadline = Date.now() + deadlineMs;
	while (!(await found())) {
		if (Date.now() > deadline) throw new Error(`gave up waiting for ${what}`);
		await new Promise((r) => setTimeout(r, 100));
	}
}

async function kill(child: ChildProcess) {
	const exited = new Promise((resolve) => child.once('exit', resolve));
	child.kill('SIGKILL');
	await exited;
}

async function paymentRow(bookingId: string) {
	const [row] = await db.select().from(payment).where(eq(payment.bookingId, bookingId));
	return row!;
}
async function postings(bookingId: string, kind: 'release' | 'refund') {
	return db
		.select()
		.from(ledgerTransaction)
		.where(and(eq(ledgerTransaction.bookingId, bookingId), eq(ledgerTransaction.kind, kind)));
}
const transfersOf = async (bookingId: string) =>
	(await stripe().transfers.list({ transfer_group: transferGroupOf(bookingId) })).data;
const refundsOf = async (chargeId: string) =>
	(await stripe().refunds.list({ charge: chargeId })).data;

describe('killed in the middle of a release', () => {
	it('leaves the release asked for, and the schedule’s retry finishes it with the same transfer', async () => {
		const made = await paidBookingIn(world);
		await world.control('/slow-next', { count: 1, ms: HELD_ANSWER_MS });
		const call = startMoneyCall(['release', made.bookingId]);
		try {
			// The provider has made the transfer; its answer is held, so the child is mid-call.
			await waitFor(
				`the transfer (child said: ${call.output()})`,
				async () => (await transfersOf(made.bookingId)).length === 1
			);
		} finally {
			await kill(call.child);
		}
		expect(call.output()).not.toContain('outcome');
		const [madeTransfer] = await transfersOf(made.bookingId);

		// Nothing of the call committed but the request for it.
		const afterKill = await paymentRow(made.bookingId);
		expect(afterKill.releaseRequestedAt).toBeInstanceOf(Date);
		expect(afterKill.releasedAt).toBeNull();
		expect(await postings(made.bookingId, 'release')).toHaveLength(0);
		expect(await heldCents(db, made.bookingId)).toBe(made.chosen.totalCents);

		// After the restart the held-funds-release schedule runs this.
		expect(await retryPendingReleases()).toBe(1);
		expect(await retryPendingReleases()).toBe(0);
		const transfers = await transfersOf(made.bookingId);
		expect(transfers.map((t) => t.id)).toEqual([madeTransfer!.id]);
		const released = await paymentRow(made.bookingId);
		expect(released.transferId).toBe(madeTransfer!.id);
		expect(released.releasedAt).toBeInstanceOf(Date);
		const release = await postings(made.bookingId, 'release');
		expect(release.map((t) => t.reference)).toEqual([madeTransfer!.id]);
		expect(await heldCents(db, made.bookingId)).toBe(0);
	});
});

describe('killed in the middle of a refund', () => {
	it('is ledgered once, from the provider’s webhook that waited for the dead call', async () => {
		const made = await paidBookingIn(world);
		const { chargeId } = await paymentRow(made.bookingId);
		await world.control('/slow-next', { count: 1, ms: HELD_ANSWER_MS });
		const call = startMoneyCall(['refund', made.bookingId, '2000']);
		try {
			await waitFor(
				`the refund (child said: ${call.output()})`,
				async () => (await refundsOf(chargeId!)).length === 1
			);
		} finally {
			await kill(call.child);
		}
		expect(call.output()).not.toContain('outcome');

		// charge.refunded waited for the dead call's row lock; it now records the refund.
		await waitFor('the refund in the ledger', async () => {
			return (await postings(made.bookingId, 'refund')).length > 0;
		});
		expect(await postings(made.bookingId, 'refund')).toHaveLength(1);
		expect(await heldCents(db, made.bookingId)).toBe(made.chosen.totalCents - 2000);
		expect(await refundsOf(chargeId!)).toHaveLength(1);
	});

	it('without the webhook, the same call again returns the provider’s refund, ledgered once', async () => {
		const made = await paidBookingIn(world);
		const { chargeId } = await paymentRow(made.bookingId);
		await world.control('/webhook', { url: null });
		try {
			await world.control('/slow-next', { count: 1, ms: HELD_ANSWER_MS });
			const call = startMoneyCall(['refund', made.bookingId, '2000']);
			try {
				await waitFor(
					`the refund (child said: ${call.output()})`,
					async () => (await refundsOf(chargeId!)).length === 1
				);
			} finally {
				await kill(call.child);
			}
			const [madeRefund] = await refundsOf(chargeId!);
			expect(await postings(made.bookingId, 'refund')).toHaveLength(0);

			// An admin asks again for the same refund: the same idempotency key, the same refund.
			const again = await refundHeldFunds(made.bookingId, 2000);
			expect(again.ok && again.refundId).toBe(madeRefund!.id);
			expect(await refundsOf(chargeId!)).toHaveLength(1);
		} finally {
			await world.control('/webhook', {
				url: `http://127.0.0.1:${String((world.hook.address() as { port: number }).port)}/`
			});
		}
		// The provider's late charge.refunded changes nothing.
		const [event] = (await stripe().events.list({ type: 'charge.refunded' })).data.filter(
			(e) => (e.data.object as { id: string }).id === chargeId
		);
		await world.control(`/events/${event!.id}/resend`);
		expect(await postings(made.bookingId, 'refund')).toHaveLength(1);
		expect(await heldCents(db, made.bookingId)).toBe(made.chosen.totalCents - 2000);
	});
});

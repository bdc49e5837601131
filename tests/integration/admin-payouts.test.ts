// The admin's payout list and its CSV: released bookings only, filtered by Adelaide release day,
// and the file parses back (csv-parse) to the same rows the table shows.
import { parse } from 'csv-parse/sync';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
	exportPayoutsCsv,
	listPayoutsForAdmin,
	PAYOUT_CSV_COLUMNS,
	summarisePayouts
} from '$lib/server/money/admin-payouts';
import { confirmWork, openConfirmationWindow } from '$lib/server/work/completion';
import { withMail } from '$lib/server/mail/outbox';
import { formatInZone } from '$lib/time';
import { paidBookingIn, startPaymentsWorld, type PaymentsWorld } from './payments-helpers';

let world: PaymentsWorld;
beforeAll(async () => {
	world = await startPaymentsWorld();
});
afterAll(() => world.close());

async function releasedBooking() {
	const made = await paidBookingIn(world);
	await withMail((tx, mail) => openConfirmationWindow(tx, mail, made.bookingId));
	const done = await confirmWork(made.bookingId, made.ownerId);
	if (!done.ok || !done.release.ok) throw new Error('release failed');
	return made;
}

describe('payouts for admins', () => {
	it('lists released bookings only, and the CSV holds the same rows', async () => {
		const released = [await releasedBooking(), await releasedBooking()];
		const heldOnly = await paidBookingIn(world);
		const today = formatInZone(new Date(), 'Australia/Adelaide', 'yyyy-MM-dd');
		const query = { from: today, to: today };
		const rows = await listPayoutsForAdmin(query, { limit: 25, offset: 0 });
		const ids = rows.map((r) => r.bookingId);
		for (const r of released) expect(ids).toContain(r.bookingId);
		expect(ids).not.toContain(heldOnly.bookingId);
		for (const r of rows) {
			// The fee and the payout make up the booking total (fees.ts releaseSplit).
			expect((r.feeCents ?? 0) + (r.payoutCents ?? 0)).toBe(r.totalCents);
		}
		const summary = await summarisePayouts(query);
		expect(summary.count).toBe(rows.length);
		expect(summary.payoutCents).toBe(rows.reduce((n, r) => n + (r.payoutCents ?? 0), 0));

		const csv = await exportPayoutsCsv(query);
		const records = parse(csv!) as string[][];
		expect(records[0]).toEqual([...PAYOUT_CSV_COLUMNS]);
		expect(records.slice(1).map((r) => r[0])).toEqual(ids);
		const first = records[1]!;
		expect(first[7]).toBe(((rows[0]!.payoutCents ?? 0) / 100).toFixed(2));
	});

	it('finds nothing in a range before any release', async () => {
		const query = { from: '2020-01-01', to: '2020-01-31' };
		expect(await listPayoutsForAdmin(query, { limit: 25, offset: 0 })).toEqual([]);
		expect((await summarisePayouts(query)).count).toBe(0);
		expect(parse((await exportPayoutsCsv(query))!)).toEqual([[...PAYOUT_CSV_COLUMNS]]);
	});
});

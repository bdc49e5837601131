import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { booking, dispute, installerProfile, job, quote } from '$lib/server/db/schema';
import { eq } from 'drizzle-orm';
import { getAdminQueueCounts, getMarketMetrics } from '$lib/server/metrics';
import { makeInstaller, makeUser } from './matching-helpers';

const HOUR = 3_600_000;
// Wednesday 25 Nov 2026, 12:30 pm in Adelaide (ACDT, UTC+10:30; IANA tz rule AS). With two whole
// weeks the window opens Monday 16 Nov at midnight Adelaide time, 2026-11-15T13:30Z.
const NOW = new Date('2026-11-25T02:00:00Z');

/** A posted job at a suburb, with quotes arriving `quoteHours` after posting. */
async function posted(
	ownerId: string,
	installers: string[],
	at: string | null,
	suburb: string,
	point: { lat: number; lng: number },
	quoteHours: number[]
) {
	const submittedAt = at ? new Date(at) : null;
	const [row] = await db
		.insert(job)
		.values({
			ownerId,
			status: submittedAt ? 'collecting_quotes' : 'drafting',
			title: `Fixture ${suburb}`,
			suburb,
			latitude: point.lat,
			longitude: point.lng,
			submittedAt
		})
		.returning({ id: job.id });
	const quoteIds: string[] = [];
	for (const [i, hours] of quoteHours.entries()) {
		const [q] = await db
			.insert(quote)
			.values({
				jobId: row!.id,
				installerId: installers[i]!,
				totalCents: 30_000,
				createdAt: new Date(submittedAt!.getTime() + hours * HOUR)
			})
			.returning({ id: quote.id });
		quoteIds.push(q!.id);
	}
	return { id: row!.id, quoteIds };
}

describe('the marketplace metrics of the admin overview', () => {
	it('match hand-computed figures on a fixture, weeks in Adelaide time', async () => {
		const owner = await makeUser('owner');
		const installers = [(await makeInstaller()).id, (await makeInstaller()).id];
		const norwood = { lat: -34.92, lng: 138.63 };
		// Week of Mon 16 Nov: A (first quote after 2 h, a second after 30 h), B (first after 30 h).
		const a = await posted(
			owner.id,
			installers,
			'2026-11-16T00:00:00Z',
			'Norwood',
			norwood,
			[2, 30]
		);
		await posted(
			owner.id,
			installers,
			'2026-11-18T00:00:00Z',
			'Norwood',
			{ lat: -34.9, lng: 138.65 },
			[30]
		);
		// Week of Mon 23 Nov: C (after 5 h), D (posted 2 h before now, no quote yet).
		const c = await posted(
			owner.id,
			installers,
			'2026-11-23T00:00:00Z',
			'Prospect',
			{ lat: -34.88, lng: 138.6 },
			[5]
		);
		await posted(
			owner.id,
			installers,
			'2026-11-25T00:00:00Z',
			'Prospect',
			{ lat: -34.88, lng: 138.6 },
			[]
		);
		// Outside: Sunday 15 Nov 11:30 pm in Adelaide (before the window), a draft, and after now.
		await posted(owner.id, installers, '2026-11-15T13:00:00Z', 'Unley', norwood, [1]);
		await posted(owner.id, installers, null, 'Unley', norwood, []);
		await posted(owner.id, installers, '2026-11-25T03:00:00Z', 'Unley', norwood, []);
		// A paid booking on A ($330.00) and a lapsed one on C (not paid: not counted).
		const slot = (day: number) => ({
			slotStart: new Date(Date.UTC(2026, 11, day, 0)),
			slotEnd: new Date(Date.UTC(2026, 11, day, 2)),
			holdExpiresAt: NOW
		});
		const [paidA, lapsedC] = await db
			.insert(booking)
			.values([
				{
					jobId: a.id,
					quoteId: a.quoteIds[0]!,
					installerId: installers[0]!,
					ownerId: owner.id,
					status: 'confirmed',
					totalCents: 33_000,
					...slot(3)
				},
				{
					jobId: c.id,
					quoteId: c.quoteIds[0]!,
					installerId: installers[0]!,
					ownerId: owner.id,
					status: 'lapsed',
					totalCents: 20_000,
					...slot(4)
				}
			])
			.returning({ id: booking.id });
		// Disputes (window: 2026-11-15T13:30Z to NOW, both ends counted):
		//   1 opened 17 Nov, settled 20 Nov          → opened, settled
		//   2 opened 1 s before the window, settled 24 Nov → settled only
		//   3 opened 24 Nov, still open               → opened
		//   4 opened 1 h after now, open              → neither
		//   5 opened at the window's first instant, settled 1 h after now → opened only
		// Hand count: opened 3 (1, 3, 5), settled 2 (1, 2).
		const disputeRow = (bookingId: string, openedAt: string, settledAt: string | null) => ({
			bookingId,
			openedBy: owner.id,
			reason: 'other',
			description: 'Fixture dispute',
			heldCents: 33_000,
			openedAt: new Date(openedAt),
			status: settledAt ? ('settled' as const) : ('open' as const),
			settledAt: settledAt ? new Date(settledAt) : null
		});
		await db
			.insert(dispute)
			.values([
				disputeRow(paidA!.id, '2026-11-17T00:00:00Z', '2026-11-20T00:00:00Z'),
				disputeRow(paidA!.id, '2026-11-15T13:29:59Z', '2026-11-24T00:00:00Z'),
				disputeRow(paidA!.id, '2026-11-24T00:00:00Z', null),
				disputeRow(lapsedC!.id, '2026-11-25T03:00:00Z', null),
				disputeRow(paidA!.id, '2026-11-15T13:30:00Z', '2026-11-25T03:00:00Z')
			]);

		const m = await getMarketMetrics(NOW, 2);
		expect(m.weeks).toEqual([
			{ week: '2026-11-16', posted: 2, quotedWithinDay: 1 },
			{ week: '2026-11-23', posted: 2, quotedWithinDay: 1 }
		]);
		expect(m.posted).toBe(4);
		// D is under a day old, so it is neither a hit nor a miss yet: 2 of A, B, C.
		expect(m.dayOld).toBe(3);
		expect(m.quotedWithinDay).toBe(2);
		// First quotes after 2, 30 and 5 hours: the median is 5.
		expect(m.medianHoursToFirstQuote).toBeCloseTo(5, 9);
		// (2 + 1 + 1 + 0) quotes over 4 posted jobs.
		expect(m.quotesPerJob).toBe(1);
		expect(m.paidBookings).toBe(1);
		expect(m.grossBookingCents).toBe(33_000);
		expect(m.disputesOpened).toBe(3);
		expect(m.disputesSettled).toBe(2);
		expect(m.suburbs).toEqual([
			{
				suburb: 'Norwood',
				lat: expect.closeTo(-34.91, 9),
				lng: expect.closeTo(138.64, 9),
				jobs: 2
			},
			{ suburb: 'Prospect', lat: expect.closeTo(-34.88, 9), lng: expect.closeTo(138.6, 9), jobs: 2 }
		]);
	});

	it('reads an empty market as zeros and nulls, every week present', async () => {
		const m = await getMarketMetrics(new Date('2020-03-04T00:00:00Z'), 4);
		expect(m.weeks.map((w) => w.week)).toEqual([
			'2020-02-10',
			'2020-02-17',
			'2020-02-24',
			'2020-03-02'
		]);
		expect(m.weeks.every((w) => w.posted === 0)).toBe(true);
		expect(m.medianHoursToFirstQuote).toBeNull();
		expect(m.quotesPerJob).toBeNull();
		expect(m.grossBookingCents).toBe(0);
		expect(m.disputesOpened).toBe(0);
		expect(m.disputesSettled).toBe(0);
		expect(m.suburbs).toEqual([]);
	});

	it('counts, beside Vetting, only applications sent and waiting for an admin', async () => {
		const before = (await getAdminQueueCounts()).vetting;
		await makeInstaller({ status: 'applied' });
		const draft = await makeInstaller({ status: 'applied' });
		// A draft has the default standing but was never sent: it waits for nobody.
		await db
			.update(installerProfile)
			.set({ submittedAt: null })
			.where(eq(installerProfile.userId, draft.id));
		await makeInstaller({ status: 'approved' });
		expect((await getAdminQueueCounts()).vetting).toBe(before + 1);
	});
});

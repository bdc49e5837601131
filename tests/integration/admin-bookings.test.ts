import { parse } from 'csv-parse/sync';
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import {
	BOOKING_CSV_COLUMNS,
	bookingCsvRecord,
	countBookingsForAdmin,
	exportBookingsCsv,
	listBookingsForAdmin
} from '$lib/server/marketplace/admin-bookings';
import { db } from '$lib/server/db';
import { booking, job } from '$lib/server/db/schema';
import { submitQuote } from '$lib/server/marketplace/quotes';
import { ADELAIDE, goodQuote, makeInstaller, makeOpenJob, pricedParts } from './matching-helpers';

const ALL = { from: '', to: '', status: '' as const, q: '' };
const EVERY = { limit: 1000, offset: 0 };

/** A booking made at `createdAt` on a fresh job, with the job's title set. */
async function bookingAt(
	createdAt: string,
	title: string,
	status: 'confirmed' | 'lapsed',
	day: number
) {
	const installer = await makeInstaller({ base: ADELAIDE });
	const made = await makeOpenJob(ADELAIDE);
	await db.update(job).set({ title }).where(eq(job.id, made.job.id));
	const sent = await submitQuote(installer.id, made.job.id, goodQuote(pricedParts(made.job)));
	if (!sent.ok) throw new Error(sent.message);
	const [row] = await db
		.insert(booking)
		.values({
			jobId: made.job.id,
			quoteId: sent.quoteId,
			installerId: installer.id,
			ownerId: made.ownerId,
			slotStart: new Date(Date.UTC(2027, 0, day, 0)),
			slotEnd: new Date(Date.UTC(2027, 0, day, 2)),
			holdExpiresAt: new Date(createdAt),
			status,
			totalCents: 32_450,
			createdAt: new Date(createdAt)
		})
		.returning({ id: booking.id });
	return row!.id;
}

describe('the admin booking list and its CSV export', () => {
	it('filters by Adelaide calendar days, status and words, and the CSV holds exactly those rows', async () => {
		// 1 Dec 2026 00:10 in Adelaide is 30 Nov 13:40 UTC (ACDT, UTC+10:30; IANA tz rule AS).
		const early = await bookingAt('2026-11-30T13:40:00Z', 'Hatch for Bellweather', 'confirmed', 4);
		const late = await bookingAt('2026-12-01T13:20:00Z', 'Wagon for Bellweather', 'lapsed', 5);
		const outside = await bookingAt(
			'2026-11-30T13:20:00Z',
			'=HYPERLINK("x") Bellweather',
			'confirmed',
			6
		);
		const query = { ...ALL, q: 'Bellweather' };
		const dec1 = await listBookingsForAdmin(
			{ ...query, from: '2026-12-01', to: '2026-12-01' },
			EVERY
		);
		// 'late' is 1 Dec 23:50 in Adelaide; 'outside' is 30 Nov 23:50.
		expect(dec1.map((r) => r.id).sort()).toEqual([early, late].sort());
		const confirmed = await listBookingsForAdmin({ ...query, status: 'confirmed' }, EVERY);
		expect(confirmed.map((r) => r.id).sort()).toEqual([early, outside].sort());
		expect(await countBookingsForAdmin(query)).toBe(3);
		expect(await countBookingsForAdmin({ ...query, from: '2026-12-01' })).toBe(2);

		const csv = await exportBookingsCsv(query);
		const records = parse(csv!, { bom: false }) as string[][];
		expect(records[0]).toEqual([...BOOKING_CSV_COLUMNS]);
		const rows = await listBookingsForAdmin(query, EVERY);
		expect(records.slice(1)).toEqual(rows.map(bookingCsvRecord));
		expect(records.slice(1).map((r) => r[0])).toEqual(rows.map((r) => r.id));
		// Amounts as plain dollars; a title a spreadsheet would run is defused.
		expect(records[1]?.[7]).toBe('324.50');
		const formula = records.find((r) => r[0] === outside);
		expect(formula?.[2]).toBe(`'=HYPERLINK("x") Bellweather`);
	});

	it('pages newest first without repeats', async () => {
		const marker = `Pagetest${crypto.randomUUID().slice(0, 5)}`;
		for (let i = 0; i < 5; i++) {
			await bookingAt(
				`2026-10-0${String(i + 1)}T02:00:00Z`,
				`${marker} ${String(i)}`,
				'confirmed',
				10 + i
			);
		}
		const query = { ...ALL, q: marker };
		const first = await listBookingsForAdmin(query, { limit: 2, offset: 0 });
		const second = await listBookingsForAdmin(query, { limit: 2, offset: 2 });
		const third = await listBookingsForAdmin(query, { limit: 2, offset: 4 });
		const titles = [...first, ...second, ...third].map((r) => r.title);
		expect(titles).toEqual([4, 3, 2, 1, 0].map((i) => `${marker} ${String(i)}`));
	});
});

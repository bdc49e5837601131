import { describe, expect, it } from 'vitest';
import { MAX_QUOTE_TOTAL_CENTS, priceQuote, quoteProblems, travelFeeCents } from './pricing';
import type { WeeklyHours } from '../work/schedule';
import { localToUtc } from '../time';

describe('travelFeeCents', () => {
	it('charges each whole or part km beyond the free radius', () => {
		// 23.4 km with 10 km free: 13.4 km beyond, billed as 14 km x $1.50 = $21.00 (worked by hand).
		expect(travelFeeCents(23.4, 10, 150)).toBe(2100);
		expect(travelFeeCents(9.9, 10, 150)).toBe(0);
		expect(travelFeeCents(12, 10, 150)).toBe(300);
	});
});

describe('priceQuote', () => {
	const labourOnly = {
		labour: { label: 'Labour', cents: 10_000 },
		parts: [],
		camera: null,
		travelCents: 0,
		travelLabel: 'Travel',
		gstRegistered: true
	};

	it('adds the lines and shows GST as 1/11 of the inclusive total', () => {
		const priced = priceQuote({
			labour: { label: 'Labour', cents: 19_800 },
			parts: [
				{ label: 'Fuse tap, mini blade', quantity: 2, unitCents: 495 },
				{ label: 'Hard-wire kit', quantity: 1, unitCents: 4_290 }
			],
			camera: null,
			travelCents: 2_100,
			travelLabel: 'Travel',
			gstRegistered: true
		});
		// 19 800 + 2 x 495 + 4 290 + 2 100 = 27 180 cents (worked by hand).
		expect(priced.totalCents).toBe(27_180);
		expect(priced.labourCents).toBe(19_800);
		expect(priced.partsCents).toBe(5_280);
		expect(priced.travelCents).toBe(2_100);
		// GST in a GST-inclusive price is 1/11 (Australian Taxation Office): 27 180 / 11 = 2 470.9 → 2 471.
		expect(priced.gstCents).toBe(2_471);
		expect(priced.lines.map((l) => l.kind)).toEqual(['labour', 'part', 'part', 'travel']);
	});

	it('counts a supplied camera with the parts and leaves out a zero travel line', () => {
		const priced = priceQuote({
			labour: { label: 'Labour', cents: 10_000 },
			parts: [],
			camera: { label: 'Camera', cents: 25_000 },
			travelCents: 0,
			travelLabel: 'Travel',
			gstRegistered: true
		});
		expect(priced.partsCents).toBe(25_000);
		expect(priced.lines.some((l) => l.kind === 'travel')).toBe(false);
		// 35 000 / 11 = 3 181.8 → 3 182 (ATO 1/11 rule, rounded half up).
		expect(priced.gstCents).toBe(3_182);
	});

	it('carries no GST when the installer is not registered for GST', () => {
		// Source: Australian Taxation Office, "Registering for GST" — only registered businesses
		// charge GST; the total is what the owner pays either way.
		const priced = priceQuote({ ...labourOnly, gstRegistered: false });
		expect(priced.totalCents).toBe(10_000);
		expect(priced.gstCents).toBe(0);
		// Registered: 10 000 / 11 = 909.09 -> 909 (ATO 1/11 rule).
		expect(priceQuote(labourOnly).gstCents).toBe(909);
	});

	it('refuses negative or fractional amounts', () => {
		const input = { ...labourOnly, labour: { label: 'Labour', cents: -1 } };
		expect(() => priceQuote(input)).toThrow(RangeError);
		expect(() => priceQuote({ ...input, labour: { label: 'L', cents: 10.5 } })).toThrow(RangeError);
	});
});

describe('quoteProblems', () => {
	const zone = 'Australia/Adelaide';
	const hours: WeeklyHours = [1, 2, 3, 4, 5].map((weekday) => ({
		weekday: weekday as 1 | 2 | 3 | 4 | 5,
		start: '08:00',
		end: '17:00'
	}));
	const now = localToUtc('2026-06-01', '09:00', zone); // a Monday
	const slot = (date: string, start: string, end: string) => ({
		start: localToUtc(date, start, zone),
		end: localToUtc(date, end, zone)
	});
	const good = {
		totalCents: 30_000,
		slots: [slot('2026-06-03', '09:00', '11:00'), slot('2026-06-04', '13:00', '15:00')],
		hours,
		blocked: [],
		bookings: [],
		timeZone: zone,
		expiresAt: localToUtc('2026-06-20', '00:00', zone),
		now
	};

	it('accepts a sensible quote', () => {
		expect(quoteProblems(good)).toEqual([]);
	});

	it('refuses a zero or absurd total', () => {
		expect(quoteProblems({ ...good, totalCents: 0 })).toEqual(['A quote needs a total above $0.']);
		expect(quoteProblems({ ...good, totalCents: MAX_QUOTE_TOTAL_CENTS })).toEqual([]);
		expect(quoteProblems({ ...good, totalCents: MAX_QUOTE_TOTAL_CENTS + 1 })[0]).toMatch(
			/over \$20,000/
		);
	});

	it('refuses a slot outside working hours, on a Saturday, or past, and one slot alone', () => {
		// 6 June 2026 is a Saturday (any 2026 calendar).
		const saturday = quoteProblems({
			...good,
			slots: [good.slots[0]!, slot('2026-06-06', '09:00', '11:00')]
		});
		expect(saturday).toEqual(['The time Sat 6 Jun, 9:00 am is outside your working hours.']);
		const evening = quoteProblems({
			...good,
			slots: [good.slots[0]!, slot('2026-06-04', '16:00', '18:00')]
		});
		expect(evening[0]).toMatch(/outside your working hours/);
		expect(quoteProblems({ ...good, slots: [good.slots[0]!] })).toEqual([
			'Offer two or three times for the fit.'
		]);
		const past = quoteProblems({
			...good,
			slots: [slot('2026-05-29', '09:00', '11:00'), good.slots[1]!]
		});
		expect(past[0]).toMatch(/in the past/);
	});

	it('refuses slots that clash with a booking or with each other, and a past expiry', () => {
		const booked = [slot('2026-06-03', '10:00', '12:00')];
		expect(quoteProblems({ ...good, bookings: booked })[0]).toMatch(/clashes with one of your/);
		const overlapping = quoteProblems({
			...good,
			slots: [good.slots[0]!, slot('2026-06-03', '10:00', '12:00')]
		});
		expect(overlapping).toEqual([
			'The time Wed 3 Jun, 10:00 am overlaps another time you offered.'
		]);
		expect(quoteProblems({ ...good, expiresAt: new Date(now.getTime() - 1) })).toEqual([
			'The expiry date has passed; choose a later one.'
		]);
	});
});

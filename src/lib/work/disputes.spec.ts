import { describe, expect, it } from 'vitest';
import { settlementMoney } from './disputes';

// Tapline's fee as the payments issue sets it by default: 10 % with a $15.00 minimum.
const FEE = { percentBasisPoints: 1000, minimumCents: 1500 };

describe('settlementMoney', () => {
	it('releases everything held, with the usual fee: $550.00 → $55.00 fee, $495.00 payout', () => {
		// Fee rule: the payments issue; GST: Australian Taxation Office, 1/11 of a GST-inclusive
		// price (5500 / 11 = 500).
		expect(settlementMoney('release', 55_000, null, FEE)).toEqual({
			ok: true,
			refundCents: 0,
			releaseCents: 55_000,
			split: { totalCents: 55_000, feeCents: 5500, gstOnFeeCents: 500, payoutCents: 49_500 }
		});
	});

	it('refunds part and takes the fee on the released remainder only', () => {
		// $550.00 held, $150.00 refunded: $400.00 released; 10 % of $400.00 = $40.00 fee
		// (not $55.00 on the whole), GST 4000 / 11 = 363.63… → 364 (ATO 1/11, half up).
		expect(settlementMoney('partial_refund', 55_000, 15_000, FEE)).toEqual({
			ok: true,
			refundCents: 15_000,
			releaseCents: 40_000,
			split: { totalCents: 40_000, feeCents: 4000, gstOnFeeCents: 364, payoutCents: 36_000 }
		});
	});

	it('applies the minimum fee to a small remainder, never more than the remainder', () => {
		// $100.00 released → 10 % is $10.00, under the $15.00 minimum (payments issue).
		const small = settlementMoney('partial_refund', 55_000, 45_000, FEE);
		expect(small.ok && small.split).toMatchObject({ feeCents: 1500, payoutCents: 8500 });
		// $10.00 released: the fee is capped at what is released, nothing is paid out.
		const tiny = settlementMoney('partial_refund', 55_000, 54_000, FEE);
		expect(tiny.ok && tiny.split).toMatchObject({ feeCents: 1000, payoutCents: 0 });
	});

	it('refunds all of it on a full refund, with no fee', () => {
		expect(settlementMoney('full_refund', 55_000, null, FEE)).toEqual({
			ok: true,
			refundCents: 55_000,
			releaseCents: 0,
			split: null
		});
	});

	it('moves nothing for a return visit', () => {
		expect(settlementMoney('return_visit', 55_000, null, FEE)).toEqual({
			ok: true,
			refundCents: 0,
			releaseCents: 0,
			split: null
		});
	});

	it('refuses a partial refund of nothing, of all of it or of more (Tapline rule)', () => {
		for (const bad of [null, 0, -100]) {
			expect(settlementMoney('partial_refund', 55_000, bad, FEE)).toMatchObject({ ok: false });
		}
		const all = settlementMoney('partial_refund', 55_000, 55_000, FEE);
		expect(all).toMatchObject({ ok: false });
		expect(!all.ok && all.message).toContain('$550.00');
		expect(settlementMoney('partial_refund', 55_000, 55_001, FEE)).toMatchObject({ ok: false });
	});

	it('refuses to settle money when nothing is held', () => {
		expect(settlementMoney('release', 0, null, FEE)).toMatchObject({ ok: false });
		expect(settlementMoney('return_visit', 0, null, FEE)).toMatchObject({ ok: true });
	});
});

describe('dollarsToCents (the settle form’s refund field)', () => {
	it('reads dollars and cents exactly, and refuses what is not a sum of money', async () => {
		const { dollarsToCents } = await import('../forms/dispute');
		expect(dollarsToCents('150')).toBe(15_000);
		expect(dollarsToCents('150.5')).toBe(15_050);
		expect(dollarsToCents('$150.05')).toBe(15_005);
		// 0.29 × 100 is 28.999… in binary floating point; the string is read digit by digit.
		expect(dollarsToCents('0.29')).toBe(29);
		for (const bad of ['', 'abc', '1.234', '-5', '1e3', '12,50']) {
			expect(dollarsToCents(bad)).toBeNull();
		}
	});
});

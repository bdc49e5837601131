import { describe, expect, it } from 'vitest';
import { cancellationSettlement } from './cancellation';

// The rules checked here are the payments issue's: owner more than 48 h ahead → full refund;
// owner later → the configured late fee to the installer; installer → full refund, job re-opens.
const slotStart = new Date('2026-12-10T00:00:00Z');
const hoursBefore = (h: number) => new Date(slotStart.getTime() - h * 3_600_000);

describe('cancellationSettlement', () => {
	it('refunds an owner in full more than 48 hours ahead', () => {
		const s = cancellationSettlement({
			cancelledBy: 'owner',
			at: hoursBefore(48.01),
			slotStart,
			heldCents: 55_000,
			lateFeeCents: 5000
		});
		expect(s).toMatchObject({ refundCents: 55_000, lateFeeCents: 0, reopenJob: false });
	});

	it('charges the late fee at exactly 48 hours and later', () => {
		for (const h of [48, 2, 0, -1]) {
			const s = cancellationSettlement({
				cancelledBy: 'owner',
				at: hoursBefore(h),
				slotStart,
				heldCents: 55_000,
				lateFeeCents: 5000
			});
			expect(s).toMatchObject({ refundCents: 50_000, lateFeeCents: 5000, reopenJob: false });
		}
	});

	it('caps the late fee at what is held', () => {
		const s = cancellationSettlement({
			cancelledBy: 'owner',
			at: hoursBefore(1),
			slotStart,
			heldCents: 3000,
			lateFeeCents: 5000
		});
		expect(s).toMatchObject({ refundCents: 0, lateFeeCents: 3000 });
	});

	it('refunds in full and re-opens the job when the installer cancels, however late', () => {
		const s = cancellationSettlement({
			cancelledBy: 'installer',
			at: hoursBefore(1),
			slotStart,
			heldCents: 55_000,
			lateFeeCents: 5000
		});
		expect(s).toMatchObject({ refundCents: 55_000, lateFeeCents: 0, reopenJob: true });
	});

	it('always splits exactly what is held', () => {
		for (const held of [0, 1, 4999, 5000, 5001, 123_456]) {
			for (const h of [100, 10]) {
				const s = cancellationSettlement({
					cancelledBy: 'owner',
					at: hoursBefore(h),
					slotStart,
					heldCents: held,
					lateFeeCents: 5000
				});
				expect(s.refundCents + s.lateFeeCents).toBe(held);
			}
		}
	});
});

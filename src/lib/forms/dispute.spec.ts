import { describe, expect, it } from 'vitest';
import { settleSchema } from './dispute';

const SETTLEMENT = { outcome: 'full_refund', note: 'The camera was never wired in.' };

describe('settleSchema', () => {
	it('refuses a settlement posted without the confirmation tick', () => {
		const missing = settleSchema.safeParse(SETTLEMENT);
		expect(missing.success).toBe(false);
		expect(missing.error?.issues.map((i) => [i.path[0], i.message])).toEqual([
			['confirm', 'Tick the box to confirm']
		]);
		expect(settleSchema.safeParse({ ...SETTLEMENT, confirm: '' }).success).toBe(false);
		expect(settleSchema.safeParse({ ...SETTLEMENT, confirm: 'off' }).success).toBe(false);
	});

	it('takes a settlement with the box ticked', () => {
		expect(settleSchema.safeParse({ ...SETTLEMENT, confirm: 'on' }).success).toBe(true);
	});
});

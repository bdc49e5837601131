import { describe, expect, it } from 'vitest';
import { bookingStatusAt, holdHasRunOut, jobStatusShown, quoteStatusShown } from './holds';

const at = (iso: string) => new Date(iso);

describe('holds read at a moment', () => {
	const held = { status: 'awaiting_payment' as const, holdExpiresAt: at('2026-12-08T01:30:00Z') };

	it('reads a hold as lapsed from the minute it runs out, not before', () => {
		expect(holdHasRunOut(held, at('2026-12-08T01:29:59Z'))).toBe(false);
		expect(holdHasRunOut(held, at('2026-12-08T01:30:00Z'))).toBe(true);
		expect(bookingStatusAt(held, at('2026-12-08T01:29:59Z'))).toBe('awaiting_payment');
		expect(bookingStatusAt(held, at('2026-12-08T02:00:00Z'))).toBe('lapsed');
	});

	it('never lapses a confirmed booking', () => {
		const paid = { status: 'confirmed' as const, holdExpiresAt: at('2026-12-08T01:30:00Z') };
		expect(bookingStatusAt(paid, at('2027-01-01T00:00:00Z'))).toBe('confirmed');
	});

	it('shows the job open and the quote live again once no booking is live', () => {
		expect(jobStatusShown('booked', false)).toBe('collecting_quotes');
		expect(jobStatusShown('booked', true)).toBe('booked');
		expect(jobStatusShown('withdrawn', false)).toBe('withdrawn');
		expect(quoteStatusShown('accepted', false)).toBe('live');
		expect(quoteStatusShown('accepted', true)).toBe('accepted');
		expect(quoteStatusShown('declined', false)).toBe('declined');
	});
});

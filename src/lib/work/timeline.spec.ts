import { describe, expect, it } from 'vitest';
import { bookingEntries, mergeTimeline, paymentEntries, type TimelineEntry } from './timeline';

const at = (iso: string) => new Date(iso);

function message(key: string, iso: string): TimelineEntry {
	return {
		kind: 'message',
		key,
		at: at(iso),
		from: 'owner',
		authorName: 'Pat',
		body: key,
		masked: []
	};
}

function ledger(key: string, iso: string): TimelineEntry {
	return {
		kind: 'ledger',
		key,
		at: at(iso),
		transactionKind: 'payment',
		memo: key,
		entries: [
			{ account: 'platform_cash', amountCents: 100 },
			{ account: 'owner_funds_held', amountCents: -100 }
		]
	};
}

describe('mergeTimeline', () => {
	it('puts every source in one list, oldest first', () => {
		const merged = mergeTimeline(
			[message('m2', '2026-12-01T03:00:00Z'), message('m1', '2026-12-01T01:00:00Z')],
			bookingEntries({
				createdAt: at('2026-12-01T02:00:00Z'),
				holdExpiresAt: at('2026-12-01T02:30:00Z')
			}),
			[ledger('t1', '2026-12-01T02:10:00Z')]
		);
		expect(merged.map((e) => e.key)).toEqual(['m1', 'booked', 't1', 'hold-ends', 'm2']);
	});

	it('breaks ties at one instant by kind (booking, provider event, payment, ledger, message), then by key', () => {
		const same = '2026-12-01T02:00:00Z';
		const entries = [
			message('b-message', same),
			{
				kind: 'provider-event' as const,
				key: 'event:evt_1',
				at: at(same),
				type: 'charge.refunded'
			},
			ledger('z-ledger', same),
			ledger('a-ledger', same),
			...paymentEntries({
				createdAt: at(same),
				paidAt: null,
				refundedAfterLapseAt: null,
				releaseRequestedAt: null,
				releasedAt: null,
				payoutCents: null
			}),
			...bookingEntries({ createdAt: at(same), holdExpiresAt: at('2026-12-01T02:30:00Z') })
		];
		const expected = [
			'booked',
			'event:evt_1',
			'checkout-opened',
			'a-ledger',
			'z-ledger',
			'b-message',
			'hold-ends'
		];
		expect(mergeTimeline(entries).map((e) => e.key)).toEqual(expected);
		// The same list whatever order the sources came in.
		expect(mergeTimeline([...entries].reverse()).map((e) => e.key)).toEqual(expected);
	});

	it('leaves the inputs as they were', () => {
		const source = [message('m2', '2026-12-01T03:00:00Z'), message('m1', '2026-12-01T01:00:00Z')];
		mergeTimeline(source);
		expect(source.map((e) => e.key)).toEqual(['m2', 'm1']);
	});
});

describe('paymentEntries', () => {
	it('has an entry for each step that happened, the payout on the release', () => {
		const entries = paymentEntries({
			createdAt: at('2026-12-01T02:00:00Z'),
			paidAt: at('2026-12-01T02:05:00Z'),
			refundedAfterLapseAt: null,
			releaseRequestedAt: at('2026-12-05T02:00:00Z'),
			releasedAt: at('2026-12-05T02:01:00Z'),
			payoutCents: 29_000
		});
		expect(entries.map((e) => (e.kind === 'payment' ? [e.step, e.amountCents] : null))).toEqual([
			['checkout-opened', null],
			['paid', null],
			['release-requested', null],
			['released', 29_000]
		]);
	});
});

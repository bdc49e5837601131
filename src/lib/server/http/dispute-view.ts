/**
 * The part of a dispute both parties' pages show, as plain data: where it stands, the reason and
 * outcome in words, the money in dollars, the return visit, and the timeline.
 */
import { DISPUTE_OUTCOME_LABELS, DISPUTE_REASON_LABELS, labelOf } from '$lib/labels';
import { formatAud } from '$lib/money/money';
import { formatSlotLabel } from '$lib/work/schedule';
import { formatDayTime } from '$lib/time';
import type { getDisputeForParty } from '../work/disputes';

type Found = NonNullable<Awaited<ReturnType<typeof getDisputeForParty>>>;

export function disputeView(found: Found, now: Date) {
	const d = found.dispute;
	const zone = found.timeZone;
	return {
		timeZone: zone,
		held: formatAud(found.held),
		confirmBy: found.booking.confirmBy ? formatDayTime(found.booking.confirmBy, zone, now) : null,
		dispute: d
			? {
					id: d.id,
					status: d.status,
					reason: labelOf(DISPUTE_REASON_LABELS, d.reason),
					openedAt: formatDayTime(d.openedAt, zone, now),
					outcome: d.outcome ? DISPUTE_OUTCOME_LABELS[d.outcome] : null,
					refund: d.refundCents ? formatAud(d.refundCents) : null,
					payout: d.payoutCents ? formatAud(d.payoutCents) : null,
					fee: d.feeCents ? formatAud(d.feeCents) : null,
					visit:
						d.returnVisitStart && d.returnVisitEnd
							? formatSlotLabel(
									{
										start: d.returnVisitStart.toISOString(),
										end: d.returnVisitEnd.toISOString()
									},
									zone,
									now
								)
							: null,
					settledAt: d.settledAt ? formatDayTime(d.settledAt, zone, now) : null,
					note: d.settlementNote
				}
			: null,
		timeline: found.timeline
	};
}

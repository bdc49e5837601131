/**
 * How a provisional booking's hold reads at a moment. Holds are lapsed in the database by the
 * `booking-hold-lapse` schedule (within a minute) and by the next booking of the job; pages only
 * read, so they show a hold that has run out as lapsed from its time, without writing. Pure.
 */

/** True when a provisional booking's hold has run out at `now`. */
export function holdHasRunOut(
	booking: { status: string; holdExpiresAt: Date },
	now: Date
): boolean {
	return booking.status === 'awaiting_payment' && booking.holdExpiresAt.getTime() <= now.getTime();
}

/** The booking's standing as shown at `now`: a run-out hold reads as lapsed. */
export function bookingStatusAt<S extends string>(
	booking: { status: S; holdExpiresAt: Date },
	now: Date
): S | 'lapsed' {
	return holdHasRunOut(booking, now) ? 'lapsed' : booking.status;
}

/** A job's standing as shown: booked only while a booking of it is live. */
export function jobStatusShown<S extends string>(status: S, hasLiveBooking: boolean) {
	return status === 'booked' && !hasLiveBooking ? ('collecting_quotes' as const) : status;
}

/** A quote's standing as shown: accepted only while its booking is live. */
export function quoteStatusShown<S extends string>(status: S, hasLiveBooking: boolean) {
	return status === 'accepted' && !hasLiveBooking ? ('live' as const) : status;
}

/**
 * The seam where payment into held funds will plug in. Today Tapline takes no money: a booking
 * stays 'awaiting_payment' and its hold runs out unless the payment step confirms it. The payment
 * issue implements {@link startHeldFundsPayment} (create the payment, send the owner to it) and,
 * on success, calls `confirmBooking` in bookings.ts. Nothing here pretends a payment succeeded.
 */

/** What starting a payment gives the booking page. */
export type HeldFundsStart =
	{ status: 'redirect'; url: string } | { status: 'unavailable'; message: string };

/**
 * Starts paying a provisional booking into held funds.
 * @param bookingId the owner's provisional booking
 * @returns today always 'unavailable', with a message for the owner
 */
export async function startHeldFundsPayment(_bookingId: string): Promise<HeldFundsStart> {
	return Promise.resolve({
		status: 'unavailable',
		message:
			'Payment into held funds is not open yet. Your booking stays provisional and the slot is held until the time shown; nothing has been charged.'
	});
}

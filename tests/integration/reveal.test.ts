// Issue 11, item 14: a provisional booking (waiting for payment) shows the installer neither the
// owner's name nor the address or exact point, and contact details in the thread stay masked;
// only a booking confirmed by payment reveals them.
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { MASK_PLACEHOLDER } from '$lib/masking';
import { db } from '$lib/server/db';
import { booking, quote, user } from '$lib/server/db/schema';
import { bookQuote, confirmBooking } from '$lib/server/marketplace/bookings';
import { getInstallerContext, getJobForInstaller } from '$lib/server/marketplace/matching';
import { submitQuote } from '$lib/server/marketplace/quotes';
import { listJobMessages, postJobMessage } from '$lib/server/marketplace/threads';
import { ADELAIDE, goodQuote, makeInstaller, makeOpenJob, pricedParts } from './matching-helpers';

describe('what a booking reveals to the installer', () => {
	it('reveals the owner and address only once the booking is confirmed by payment', async () => {
		const { job: j, ownerId } = await makeOpenJob(ADELAIDE);
		const installer = await makeInstaller({ base: ADELAIDE });
		const sent = await submitQuote(installer.id, j.id, goodQuote(pricedParts(j)));
		expect(sent.ok).toBe(true);
		const [q] = await db.select().from(quote).where(eq(quote.jobId, j.id));
		const booked = await bookQuote(ownerId, j.id, q!.id, q!.slots[0]!.start);
		if (!booked.ok) throw new Error(booked.message);
		const [owner] = await db
			.select({ name: user.displayName })
			.from(user)
			.where(eq(user.id, ownerId));

		const ctx = (await getInstallerContext(installer.id))!;
		const provisional = await getJobForInstaller(j.id, ctx);
		expect(provisional?.booking?.status).toBe('awaiting_payment');
		expect(provisional?.revealed).toBeNull();
		const shown = JSON.stringify(provisional);
		expect(shown).not.toContain('Secret Street');
		expect(shown).not.toContain(owner!.name);
		expect(shown).not.toContain(String(ADELAIDE.lng));

		const owners = { id: ownerId, role: 'owner' as const };
		const early = await postJobMessage(j.id, installer.id, owners, 'Ring me on 0412 345 678');
		expect(early).toMatchObject({ ok: true, masked: ['phone'] });

		expect((await confirmBooking(booked.bookingId)).ok).toBe(true);
		const confirmed = await getJobForInstaller(j.id, ctx);
		expect(confirmed?.revealed).toMatchObject({
			ownerName: owner!.name,
			addressLine: '1 Secret Street',
			exact: { lat: ADELAIDE.lat, lng: ADELAIDE.lng }
		});
		const later = await postJobMessage(j.id, installer.id, owners, 'Ring me on 0412 345 678');
		expect(later).toMatchObject({ ok: true, masked: [] });
		const thread = await listJobMessages(j.id, installer.id);
		expect(thread.map((m) => m.body)).toEqual([
			`Ring me on ${MASK_PLACEHOLDER}`,
			'Ring me on 0412 345 678'
		]);
		const [row] = await db.select().from(booking).where(eq(booking.id, booked.bookingId));
		expect(row?.status).toBe('confirmed');
	});
});

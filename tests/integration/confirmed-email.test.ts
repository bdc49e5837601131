// Issue 11, item 8: posting a job, booking, writing in a thread and sending an installer
// application need a confirmed e-mail address, checked by the domain functions themselves.
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { quote, user } from '$lib/server/db/schema';
import { bookQuote } from '$lib/server/marketplace/bookings';
import { EMAIL_NOT_CONFIRMED } from '$lib/server/people/confirmed-email';
import { createDraftJob, postJob } from '$lib/server/marketplace/jobs';
import { submitApplication } from '$lib/server/people/installers';
import { submitQuote } from '$lib/server/marketplace/quotes';
import { postJobMessage } from '$lib/server/marketplace/threads';
import { ADELAIDE, goodQuote, makeInstaller, makeOpenJob, pricedParts } from './matching-helpers';
import { makeCompleteDraft } from './vetting-helpers';

const setConfirmed = (id: string, at: Date | null) =>
	db.update(user).set({ emailVerifiedAt: at }).where(eq(user.id, id));

const refusedUnconfirmed = { ok: false, status: 403, message: EMAIL_NOT_CONFIRMED };

describe('what needs a confirmed e-mail address', () => {
	it('refuses an unconfirmed owner posting, booking and writing, then lets them once confirmed', async () => {
		const { job: j, ownerId } = await makeOpenJob(ADELAIDE);
		const installer = await makeInstaller({ base: ADELAIDE });
		expect((await submitQuote(installer.id, j.id, goodQuote(pricedParts(j)))).ok).toBe(true);
		const [q] = await db.select().from(quote).where(eq(quote.jobId, j.id));
		await setConfirmed(ownerId, null);

		const draftId = await createDraftJob(ownerId);
		expect(await postJob(draftId, ownerId)).toMatchObject(refusedUnconfirmed);
		expect(await bookQuote(ownerId, j.id, q!.id, q!.slots[0]!.start)).toMatchObject(
			refusedUnconfirmed
		);
		const owner = { id: ownerId, role: 'owner' as const };
		expect(await postJobMessage(j.id, installer.id, owner, 'Is Tuesday fine?')).toMatchObject(
			refusedUnconfirmed
		);

		await setConfirmed(ownerId, new Date());
		expect((await postJobMessage(j.id, installer.id, owner, 'Is Tuesday fine?')).ok).toBe(true);
		expect((await bookQuote(ownerId, j.id, q!.id, q!.slots[0]!.start)).ok).toBe(true);
	});

	it('refuses an unconfirmed installer sending an application or a question', async () => {
		const applicant = await makeCompleteDraft();
		await setConfirmed(applicant.id, null);
		expect(await submitApplication(applicant.id)).toMatchObject(refusedUnconfirmed);
		await setConfirmed(applicant.id, new Date());
		expect((await submitApplication(applicant.id)).ok).toBe(true);

		const { job: j } = await makeOpenJob(ADELAIDE);
		const installer = await makeInstaller({ base: ADELAIDE });
		await setConfirmed(installer.id, null);
		const asks = { id: installer.id, role: 'installer' as const };
		expect(await postJobMessage(j.id, installer.id, asks, 'Garaged?')).toMatchObject(
			refusedUnconfirmed
		);
	});
});

import { and, eq, inArray } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { emailOutbox, job } from '$lib/server/db/schema';
import { adjustOpenJob, withdrawJob } from '$lib/server/marketplace/jobs';
import { getInstallerContext, getJobForInstaller } from '$lib/server/marketplace/matching';
import { submitQuote } from '$lib/server/marketplace/quotes';
import {
	ADELAIDE,
	goodQuote,
	localDay,
	makeInstaller,
	makeOpenJob,
	pricedParts
} from './matching-helpers';

/** A job with live quotes from `count` installers. */
async function quotedJob(count: number) {
	const made = await makeOpenJob(ADELAIDE);
	const installers = [];
	for (let i = 0; i < count; i++) {
		const installer = await makeInstaller({ base: ADELAIDE });
		const sent = await submitQuote(installer.id, made.job.id, goodQuote(pricedParts(made.job)));
		if (!sent.ok) throw new Error(sent.message);
		installers.push(installer);
	}
	return { ...made, installers };
}

async function adjustedMails(emails: string[]) {
	return db
		.select({ to: emailOutbox.toAddress, text: emailOutbox.text, subject: emailOutbox.subject })
		.from(emailOutbox)
		.where(and(eq(emailOutbox.template, 'job-adjusted'), inArray(emailOutbox.toAddress, emails)));
}

describe('adjusting a job after quotes', () => {
	it('changes the dates and note and tells every quoting installer in the same change', async () => {
		const { job: j, ownerId, installers } = await quotedJob(2);
		const windows = [
			{ date: localDay(10), window: 'afternoon' as const },
			{ date: localDay(12), window: 'morning' as const }
		];
		const result = await adjustOpenJob(j.id, ownerId, {
			windows,
			note: 'Car is in the carport; gate code by message.'
		});
		expect(result).toEqual({ ok: true, told: 2 });
		const [after] = await db.select().from(job).where(eq(job.id, j.id));
		expect(after?.preferredWindows).toEqual(windows);
		expect(after?.ownerNote).toBe('Car is in the carport; gate code by message.');
		// The request itself (what the quotes priced) is untouched.
		expect(after?.request).toEqual(j.request);
		expect(after?.draft).toMatchObject({ date1: windows[0]!.date, window1: 'afternoon' });
		const mails = await adjustedMails(installers.map((i) => i.email));
		expect(mails).toHaveLength(2);
		expect(mails[0]?.subject).toContain('dates and note');
		expect(mails[0]?.text).toContain('Your quote stands as sent');
	});

	it('sends nothing when nothing changed, and says only "note" when only the note did', async () => {
		const { job: j, ownerId, installers } = await quotedJob(1);
		const same = await adjustOpenJob(j.id, ownerId, { windows: j.preferredWindows, note: '  ' });
		expect(same).toEqual({ ok: true, told: 0 });
		expect(await adjustedMails([installers[0]!.email])).toHaveLength(0);
		const noted = await adjustOpenJob(j.id, ownerId, {
			windows: j.preferredWindows,
			note: 'Street parking only.'
		});
		expect(noted).toEqual({ ok: true, told: 1 });
		const [mail] = await adjustedMails([installers[0]!.email]);
		expect(mail?.subject).toMatch(/changed the note of/);
	});

	it('refuses past dates, another owner, and a job no longer taking quotes, writing nothing', async () => {
		const { job: j, ownerId } = await quotedJob(1);
		const past = await adjustOpenJob(j.id, ownerId, {
			windows: [{ date: localDay(-1), window: 'morning' }],
			note: 'x'
		});
		expect(past).toMatchObject({ ok: false, status: 400 });
		const stranger = await makeOpenJob(ADELAIDE);
		const other = await adjustOpenJob(j.id, stranger.ownerId, {
			windows: [{ date: localDay(9), window: 'morning' }],
			note: ''
		});
		expect(other).toMatchObject({ ok: false, status: 404 });
		const [unchanged] = await db.select().from(job).where(eq(job.id, j.id));
		expect(unchanged?.preferredWindows).toEqual(j.preferredWindows);
		expect(unchanged?.ownerNote).toBeNull();

		expect((await withdrawJob(j.id, ownerId, 'Sold the car')).ok).toBe(true);
		const closed = await adjustOpenJob(j.id, ownerId, {
			windows: [{ date: localDay(9), window: 'morning' }],
			note: ''
		});
		expect(closed).toMatchObject({ ok: false, status: 409 });
	});

	it('shows the note to a quoting installer with contact details masked before booking', async () => {
		const { job: j, ownerId, installers } = await quotedJob(1);
		await adjustOpenJob(j.id, ownerId, {
			windows: j.preferredWindows,
			note: 'Call me on 0412 345 678 when you arrive.'
		});
		const context = await getInstallerContext(installers[0]!.id);
		if (!context) throw new Error('installer context missing');
		const seen = await getJobForInstaller(j.id, context);
		expect(seen?.ownerNote).toContain('when you arrive');
		expect(seen?.ownerNote).not.toContain('0412');
	});
});

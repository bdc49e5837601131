import { eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { job, user } from '$lib/server/db/schema';
import {
	findInstallersForJob,
	getInstallerContext,
	listOfferedJobs
} from '$lib/server/marketplace/matching';
import { seedDemo } from '../../seed';
import { DEMO_JOBS } from '../../seed/jobs';
import { startDemoWorld } from './demo-world';

let stop: () => Promise<void>;
beforeAll(async () => {
	stop = await startDemoWorld();
});
afterAll(() => stop());

async function idOf(email: string) {
	const [row] = await db.select({ id: user.id }).from(user).where(eq(user.email, email));
	return row!.id;
}

describe('demo jobs', () => {
	it('put open jobs on the boards of the demo installers who can do them', async () => {
		expect(await seedDemo(process.env.DATABASE_URL as string)).toBe(true);
		const jobs = await db.select().from(job);
		// Besides these open jobs, the demo's bookings have jobs of their own (seed/story.ts), one
		// of them still collecting quotes.
		const open = jobs.filter((j) => j.status === 'collecting_quotes');
		expect(open).toHaveLength(DEMO_JOBS.length + 1);
		expect(jobs.every((j) => j.scope !== null)).toBe(true);

		// The Walkerville hatch: parking mode and a tailgate run, at the owner's place.
		const hatch = open.find((j) => j.title === '2018 Demo Hatch')!;
		const demo = (await getInstallerContext(await idOf('demo.installer@tapline.test')))!;
		const ruth = (await getInstallerContext(await idOf('ruth.akande@tapline.test')))!;
		expect((await listOfferedJobs(demo)).map((j) => j.id)).toContain(hatch.id);
		expect((await listOfferedJobs(ruth)).map((j) => j.id)).toContain(hatch.id);

		// Workshop-only Cormac (Port Adelaide) never gets the hatch, which is a mobile fit; the
		// suspended installer (Elizabeth) gets nothing at all.
		const reached = (await findInstallersForJob(hatch)).map((i) => i.email);
		expect(reached).not.toContain('cormac.lynd@tapline.test');
		const suspended = (await getInstallerContext(await idOf('arjun.mehra@tapline.test')))!;
		expect(suspended.canQuote).toBe(false);
		expect(reached).not.toContain('arjun.mehra@tapline.test');
	});
});

import { and, eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { emailOutbox, jobNotice } from '$lib/server/db/schema';
import { distanceKm, snapToGrid, type LatLng } from '$lib/geo';
import {
	boardQuerySchema,
	findInstallersForJob,
	getInstallerContext,
	getJobForInstaller,
	listOfferedJobs,
	searchBoard,
	sendNewJobDigests
} from '$lib/server/marketplace/matching';
import { makeInstaller, makeOpenJob } from './matching-helpers';

/**
 * The point on a line from `center` (north or east) whose distance, as distanceKm measures it,
 * is the largest not above `km`: a point on the circle to the last bit of a double. Found by
 * bisection, so the test does not depend on a second formula agreeing with turf's.
 */
function onCircle(center: LatLng, km: number, direction: 'north' | 'east'): LatLng {
	const at = (t: number) =>
		direction === 'north'
			? { lat: center.lat + t, lng: center.lng }
			: { lat: center.lat, lng: center.lng + t };
	let low = 0;
	let high = 5;
	for (let i = 0; i < 200; i++) {
		const mid = (low + high) / 2;
		if (distanceKm(center, at(mid)) <= km) low = mid;
		else high = mid;
	}
	return at(low);
}

// A job in the Adelaide hills-side suburbs, well inside greater Adelaide (coordinates from memory).
const JOB_AT: LatLng = { lat: -34.9531, lng: 138.6487 };

describe('which installers a job reaches', () => {
	it('includes installers exactly on and just inside their radius, not just outside', async () => {
		// Offering goes by the job's grid-cell centre (issue 11, item 1): put the job on one, so
		// the exact point and the centre agree and the boundary is tested to the metre.
		const cell = snapToGrid(JOB_AT);
		const AT = { lat: cell.lat, lng: cell.lng };
		const { job } = await makeOpenJob(AT);
		// Bases placed south and west of the job so the job sits north or east of each base.
		const southOf = (km: number) => {
			const p = onCircle(AT, km, 'north');
			return { lat: AT.lat - (p.lat - AT.lat), lng: AT.lng };
		};
		const westOf = (km: number) => {
			const p = onCircle(AT, km, 'east');
			return { lat: AT.lat, lng: AT.lng - (p.lng - AT.lng) };
		};
		const onNorth = await makeInstaller({ base: southOf(20), radiusKm: 20 });
		const onEast = await makeInstaller({ base: westOf(15), radiusKm: 15 });
		const inside = await makeInstaller({ base: southOf(24.99), radiusKm: 25 });
		const outside = await makeInstaller({ base: southOf(25.01), radiusKm: 25 });
		const outsideEast = await makeInstaller({ base: westOf(15.01), radiusKm: 15 });

		// The bisection really put them where the test says (the job is on the circle to 1e-9 km).
		const onNorthBase = southOf(20);
		expect(distanceKm(AT, onNorthBase)).toBeLessThanOrEqual(20);
		expect(distanceKm(AT, onNorthBase)).toBeGreaterThan(20 - 1e-9);

		const reached = (await findInstallersForJob(job)).map((i) => i.id);
		expect(reached).toEqual(expect.arrayContaining([onNorth.id, onEast.id, inside.id]));
		expect(reached).not.toContain(outside.id);
		expect(reached).not.toContain(outsideEast.id);

		// And the other way round: the job is on the board of those on the circle, not beyond.
		const boardOf = async (id: string) =>
			(await listOfferedJobs((await getInstallerContext(id))!)).map((j) => j.id);
		expect(await boardOf(onEast.id)).toContain(job.id);
		expect(await boardOf(onNorth.id)).toContain(job.id);
		expect(await boardOf(outsideEast.id)).not.toContain(job.id);
	});

	it('leaves out unvetted, paused, suspended, under-skilled and wrong-mode installers', async () => {
		const { job } = await makeOpenJob(JOB_AT, { locationMode: 'mobile' });
		const vetted = await makeInstaller({ base: JOB_AT });
		const applied = await makeInstaller({ base: JOB_AT, status: 'applied' });
		const paused = await makeInstaller({ base: JOB_AT, pausedReason: 'Insurance expired' });
		const suspended = await makeInstaller({ base: JOB_AT, status: 'suspended' });
		// A hatch's rear camera goes through the tailgate grommet (common trade practice).
		const noTailgate = await makeInstaller({ base: JOB_AT, skills: ['parking-mode'] });
		const workshopOnly = await makeInstaller({ base: JOB_AT, mobile: false });
		const reached = (await findInstallersForJob(job)).map((i) => i.id);
		expect(reached).toContain(vetted.id);
		for (const other of [applied, paused, suspended, noTailgate, workshopOnly]) {
			expect(reached).not.toContain(other.id);
		}
		const ctx = (await getInstallerContext(noTailgate.id))!;
		expect(await getJobForInstaller(job.id, ctx)).toBeNull();
	});
});

describe('what installers see', () => {
	it('shows the grid-cell centre and hides the owner and address until booked', async () => {
		const { job } = await makeOpenJob(JOB_AT);
		const installer = await makeInstaller({ base: JOB_AT });
		const ctx = (await getInstallerContext(installer.id))!;
		const board = (await listOfferedJobs(ctx)).find((j) => j.id === job.id);
		expect(board).toBeDefined();
		const cell = snapToGrid(JOB_AT);
		expect({ lat: board?.lat, lng: board?.lng }).toEqual({ lat: cell.lat, lng: cell.lng });
		expect(JSON.stringify(board)).not.toContain('Secret Street');
		const detail = await getJobForInstaller(job.id, ctx);
		expect(detail?.revealed).toBeNull();
		expect(JSON.stringify(detail)).not.toContain('Secret Street');
		expect(JSON.stringify(detail)).not.toContain(String(JOB_AT.lng));
	});

	it('pages the board with a cursor, filters, and cuts on the map bounds', async () => {
		const base = { lat: -35.2, lng: 138.3 }; // an empty stretch of gulf, so only these jobs match
		const installer = await makeInstaller({ base, radiusKm: 30 });
		const ids: string[] = [];
		for (let i = 0; i < 5; i++) {
			const { job } = await makeOpenJob(
				{ lat: base.lat + 0.02 * (i + 1), lng: base.lng },
				i === 4 ? { request: { bodyStyle: 'sedan', cameras: 'front' } } : {}
			);
			ids.push(job.id);
		}
		const ctx = (await getInstallerContext(installer.id))!;
		const seen: string[] = [];
		let cursor: string | undefined;
		do {
			const page = await searchBoard(ctx, boardQuerySchema.parse({ limit: '2', cursor }));
			expect(page).not.toBeNull();
			// Counted on the first page only: a later page costs its rows, not the whole circle.
			expect(page!.total).toBe(cursor === undefined ? 5 : null);
			seen.push(...page!.jobs.map((j) => j.id));
			cursor = page!.nextCursor ?? undefined;
		} while (cursor);
		// Nearest first: each job is 0.02° (about 2.2 km) further north than the last.
		expect(seen).toEqual(ids);

		const sedans = await searchBoard(ctx, boardQuerySchema.parse({ bodyStyle: 'sedan' }));
		expect(sedans!.jobs.map((j) => j.id)).toEqual([ids[4]]);
		const box = `${String(base.lng - 0.1)},${String(base.lat)},${String(base.lng + 0.1)},${String(base.lat + 0.05)}`;
		const inBox = await searchBoard(ctx, boardQuerySchema.parse({ bounds: box }));
		expect(inBox!.jobs.map((j) => j.id)).toEqual(ids.slice(0, 2));
		expect(await searchBoard(ctx, boardQuerySchema.parse({ cursor: 'garbage' }))).toBeNull();
		expect(boardQuerySchema.safeParse({ bounds: '1,2,3' }).success).toBe(false);
		expect(boardQuerySchema.safeParse({ limit: '500' }).success).toBe(false);
	});
});

describe('new-job digest', () => {
	it('e-mails each matching installer once per job, never twice', async () => {
		const far = { lat: -34.3, lng: 139.6 }; // out in the Murraylands, away from other tests' jobs
		const { job } = await makeOpenJob(far);
		const installer = await makeInstaller({ base: far, radiusKm: 10 });
		await sendNewJobDigests();
		const notices = await db
			.select()
			.from(jobNotice)
			.where(eq(jobNotice.installerId, installer.id));
		expect(notices.map((r) => r.jobId)).toEqual([job.id]);
		const digests = () =>
			db
				.select()
				.from(emailOutbox)
				.where(
					and(
						eq(emailOutbox.template, 'new-jobs-digest'),
						eq(emailOutbox.toAddress, installer.email)
					)
				);
		const first = await digests();
		expect(first).toHaveLength(1);
		expect(first[0]?.text).toContain('2018 Demo Hatch');
		await sendNewJobDigests();
		expect(await digests()).toHaveLength(1);
	});
});

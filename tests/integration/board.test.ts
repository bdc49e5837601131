// The job board in SQL (issue 9): PostGIS matching equals the pure rule of $lib/marketplace/matching, the
// boundary agrees with an independent geodesic library, keyset paging neither repeats nor skips,
// clusters add up to the total, quote counts follow the quotes, and no answer to an installer
// carries a job's true point. Small generated markets, so the file stays fast; the large market
// belongs to `npm run bench`.
import { sql } from 'drizzle-orm';
import fc from 'fast-check';
import { Geodesic } from 'geographiclib-geodesic';
import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { job, quote } from '$lib/server/db/schema';
import { EARTH_RADIUS_KM, snapToGrid, type LatLng } from '$lib/geo';
import { approximateLocation, matchProblem, requiredSkills } from '$lib/marketplace/matching';
import { postedJobColumns } from '$lib/marketplace/posted-job';
import { BOARD_SORTS, MAX_CLUSTER_CELLS_ACROSS, type BoardJob } from '$lib/marketplace/board';
import { BODY_STYLES, CAMERA_SETUPS, POWER_MODES } from '$lib/scope/request';
import { INSTALLER_SKILLS } from '$lib/people/vetting';
import {
	boardQuerySchema,
	findInstallersForJob,
	getInstallerContext,
	getJobForInstaller,
	listNewOfferedJobs,
	listOfferedJobs,
	searchBoard,
	sendNewJobDigests,
	type InstallerContext
} from '$lib/server/marketplace/matching';
import { HATCH_REQUEST, localDay, makeInstaller, makeUser } from './matching-helpers';

/** The one distance model's sphere, in geographiclib: radius EARTH_RADIUS_KM, flattening 0. */
const SPHERE = new Geodesic.Geodesic(EARTH_RADIUS_KM * 1000, 0);

/** Seeded PRNG (mulberry32), so the generated markets repeat run after run. */
function mulberry32(seed: number): () => number {
	let state = seed >>> 0;
	return () => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = state;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

const POSTED = postedJobColumns(HATCH_REQUEST);
const pick = <T>(rand: () => number, list: readonly T[]): T =>
	list[Math.floor(rand() * list.length)]!;

interface JobSpec {
	at: LatLng;
	bodyStyle: (typeof BODY_STYLES)[number];
	cameras: (typeof CAMERA_SETUPS)[number];
	power: (typeof POWER_MODES)[number];
	locationMode: 'mobile' | 'workshop' | null;
	submittedAt?: Date;
	windows?: string[];
}

/** Inserts open jobs in one statement; the board's columns as posting writes them. */
async function insertJobs(specs: JobSpec[]) {
	const owner = await makeUser('owner');
	return db
		.insert(job)
		.values(
			specs.map((s) => ({
				ownerId: owner.id,
				status: 'collecting_quotes' as const,
				...POSTED,
				bodyStyle: s.bodyStyle,
				cameras: s.cameras,
				power: s.power,
				requiredSkills: requiredSkills(s),
				locationMode: s.locationMode,
				suburb: 'Testville',
				postcode: '5000',
				latitude: s.at.lat,
				longitude: s.at.lng,
				addressLine: '1 Secret Street',
				preferredWindows: (s.windows ?? [localDay(5)]).map((date) => ({
					date,
					window: 'morning' as const
				})),
				submittedAt: s.submittedAt ?? new Date()
			}))
		)
		.returning();
}

function randomJobs(rand: () => number, centre: LatLng, n: number, spreadDeg: number): JobSpec[] {
	return Array.from({ length: n }, () => ({
		at: {
			lat: centre.lat + (rand() - 0.5) * spreadDeg,
			lng: centre.lng + (rand() - 0.5) * spreadDeg
		},
		bodyStyle: pick(rand, BODY_STYLES),
		cameras: pick(rand, CAMERA_SETUPS),
		power: pick(rand, POWER_MODES),
		locationMode: pick(rand, ['mobile', 'workshop', null] as const)
	}));
}

const context = async (id: string) => (await getInstallerContext(id))!;
const ids = (jobs: readonly { id: string }[]) => jobs.map((j) => j.id).sort();

describe('SQL matching equals the pure rule', () => {
	it('offers each random installer exactly the random jobs matchProblem offers', async () => {
		// Regions well apart (in the Southern Ocean south of the Bight: nothing else is there), one
		// per run, so each run's market is its own.
		let region = 0;
		await fc.assert(
			fc.asyncProperty(fc.integer({ min: 1, max: 2 ** 31 }), async (seed) => {
				const rand = mulberry32(seed);
				const centre = { lat: -40 - region, lng: 130 + 2 * region++ };
				const rows = await insertJobs(randomJobs(rand, centre, 40, 0.8));
				for (let i = 0; i < 6; i++) {
					const { id } = await makeInstaller({
						base: {
							lat: centre.lat + (rand() - 0.5) * 0.6,
							lng: centre.lng + (rand() - 0.5) * 0.6
						},
						radiusKm: 1 + Math.floor(rand() * 40),
						skills: INSTALLER_SKILLS.filter(() => rand() < 0.7),
						mobile: rand() < 0.7,
						workshop: rand() < 0.5
					});
					const ctx = await context(id);
					const expected = rows.filter(
						(r) =>
							matchProblem(
								{
									location: { lat: r.latitude!, lng: r.longitude! },
									locationMode: r.locationMode,
									needs: { bodyStyle: r.bodyStyle!, cameras: r.cameras!, power: r.power! } as never
								},
								ctx
							) === null
					);
					const offered = await listOfferedJobs(ctx);
					expect(ids(offered)).toEqual(ids(expected));
					// One distance model: the figure SQL shows is the pure code's figure.
					for (const j of offered) {
						const r = rows.find((row) => row.id === j.id)!;
						expect(j.distanceKm).toBe(
							approximateLocation({ lat: r.latitude!, lng: r.longitude! }, ctx.base).distanceKm
						);
					}
				}
				// And from the job's side: which installers it reaches.
				for (const r of rows.slice(0, 8)) {
					const reached = await findInstallersForJob(r);
					for (const installer of reached) {
						const ctx = await context(installer.id);
						const problem = matchProblem(
							{
								location: { lat: r.latitude!, lng: r.longitude! },
								locationMode: r.locationMode,
								needs: { bodyStyle: r.bodyStyle!, cameras: r.cameras!, power: r.power! } as never
							},
							ctx
						);
						expect(problem).toBeNull();
					}
				}
			}),
			{ numRuns: 3, seed: 9 }
		);
	});

	it('puts every job on the cell centre snapToGrid gives, to the last bit', async () => {
		const rand = mulberry32(42);
		const points = Array.from({ length: 2000 }, () => ({
			lat: -89 + rand() * 178,
			lng: -180 + rand() * 359.999
		}));
		const { rows } = await db.execute<{ lat: number; lng: number }>(sql`
			select tapline_cell_lat(p.lat) as lat, tapline_cell_lng(p.lat, p.lng) as lng
			from unnest(${`{${points.map((p) => String(p.lat)).join(',')}}`}::float8[],
				${`{${points.map((p) => String(p.lng)).join(',')}}`}::float8[]) with ordinality as p(lat, lng, n)
			order by p.n`);
		expect(rows.map((r) => [r.lat, r.lng])).toEqual(
			points.map((p) => {
				const c = snapToGrid(p);
				return [c.lat, c.lng];
			})
		);
	});
});

describe('the edge of a service circle', () => {
	it('offers a job 1 cm inside and refuses one 1 cm outside, as the geodesic library measures', async () => {
		// Reference: C. F. F. Karney, "Algorithms for geodesics", J. Geodesy 87 (2013) 43–55, as
		// implemented by geographiclib-geodesic, here on the model's sphere (flattening 0).
		const cell = snapToGrid({ lat: -45.3, lng: 120.7 });
		const [row] = await insertJobs([
			{
				at: { lat: cell.lat, lng: cell.lng },
				bodyStyle: 'sedan',
				cameras: 'front',
				power: 'socket',
				locationMode: 'mobile'
			}
		]);
		const cases: Array<{ radiusKm: number; azimuth: number; offsetM: number }> = [];
		for (const radiusKm of [5, 39, 120]) {
			for (const azimuth of [0, 73, 180, 250]) {
				for (const offsetM of [-0.01, 0.01]) cases.push({ radiusKm, azimuth, offsetM });
			}
		}
		for (const c of cases) {
			// The base sits radius ± 1 cm from the job's cell centre, seen from the job.
			const d = SPHERE.Direct(cell.lat, cell.lng, c.azimuth, c.radiusKm * 1000 + c.offsetM);
			const base = { lat: d.lat2!, lng: d.lon2! };
			const back = SPHERE.Inverse(base.lat, base.lng, cell.lat, cell.lng).s12!;
			const inside = back <= c.radiusKm * 1000;
			expect(inside).toBe(c.offsetM < 0);
			const { id } = await makeInstaller({ base, radiusKm: c.radiusKm });
			const ctx = await context(id);
			const offered = (await listOfferedJobs(ctx)).find((j) => j.id === row!.id);
			expect(Boolean(offered)).toBe(inside);
			expect(Boolean(await getJobForInstaller(row!.id, ctx))).toBe(inside);
			expect((await findInstallersForJob(row!)).some((i) => i.id === id)).toBe(inside);
			if (offered) {
				// Shown as exactly the radius, never above it, and kept by "within radius km".
				expect(offered.distanceKm).toBe(c.radiusKm);
				const within = await searchBoard(
					ctx,
					boardQuerySchema.parse({ maxKm: String(c.radiusKm) })
				);
				expect(within!.jobs.map((j) => j.id)).toContain(row!.id);
			} else {
				// One circle wider, it shows as 0.1 km over and "within radius km" drops it.
				const { id: wider } = await makeInstaller({ base, radiusKm: c.radiusKm + 1 });
				const wctx = await context(wider);
				const seen = (await listOfferedJobs(wctx)).find((j) => j.id === row!.id);
				expect(seen?.distanceKm).toBeCloseTo(c.radiusKm + 0.1, 9);
				const within = await searchBoard(
					wctx,
					boardQuerySchema.parse({ maxKm: String(c.radiusKm) })
				);
				expect(within!.jobs.map((j) => j.id)).not.toContain(row!.id);
			}
		}
	});
});

describe('keyset paging', () => {
	it('never repeats or skips a job in any sort and direction, ties included', async () => {
		const centre = { lat: -47.5, lng: 125.5 };
		const rand = mulberry32(7);
		const stamp = new Date();
		// Groups in one cell (equal distances), posted at one instant, with one date: ties everywhere.
		const specs: JobSpec[] = randomJobs(rand, centre, 45, 0.3).map((s, i) => ({
			...s,
			at: i % 3 === 0 ? centre : s.at,
			bodyStyle: 'sedan',
			cameras: 'front',
			power: 'socket',
			locationMode: 'mobile',
			submittedAt: new Date(stamp.getTime() - (i % 4) * 60_000),
			windows: [localDay(3 + (i % 3))]
		}));
		const rows = await insertJobs(specs);
		const { id: quoter } = await makeInstaller({ base: centre, radiusKm: 5 });
		// Quotes on some jobs, so the quote counts tie and differ.
		await db
			.insert(quote)
			.values(
				rows
					.filter((_r, i) => i % 4 === 1)
					.map((r) => ({ jobId: r.id, installerId: quoter, totalCents: 30000 }))
			);
		const { id } = await makeInstaller({ base: centre, radiusKm: 60 });
		const ctx = await context(id);
		const all = ids(await listOfferedJobs(ctx));
		expect(all).toEqual(ids(rows));
		for (const sort of BOARD_SORTS) {
			for (const dir of ['asc', 'desc'] as const) {
				const seen: BoardJob[] = [];
				let cursor: string | undefined;
				do {
					const page = await searchBoard(
						ctx,
						boardQuerySchema.parse({ sort, dir, limit: '7', cursor })
					);
					seen.push(...page!.jobs);
					cursor = page!.nextCursor ?? undefined;
				} while (cursor);
				expect(seen.map((j) => j.id)).toHaveLength(new Set(seen.map((j) => j.id)).size);
				expect(ids(seen)).toEqual(all);
			}
		}
	});

	it('refuses a cursor made for another sort or not made by the API', async () => {
		const { id } = await makeInstaller({ base: { lat: -47.5, lng: 125.5 }, radiusKm: 60 });
		const ctx = await context(id);
		const first = await searchBoard(ctx, boardQuerySchema.parse({ limit: '2' }));
		expect(first!.nextCursor).not.toBeNull();
		const cursor = first!.nextCursor!;
		expect(await searchBoard(ctx, boardQuerySchema.parse({ sort: 'newest', cursor }))).toBeNull();
		expect(await searchBoard(ctx, boardQuerySchema.parse({ cursor: 'garbage' }))).toBeNull();
	});
});

describe('map clusters', () => {
	it('add up to the total, for every zoom, and stay a few hundred at most', async () => {
		const centre = { lat: -49, lng: 140 };
		await insertJobs(randomJobs(mulberry32(3), centre, 120, 0.9));
		const { id } = await makeInstaller({
			base: centre,
			radiusKm: 45,
			skills: [...INSTALLER_SKILLS]
		});
		const ctx = await context(id);
		const everything = await listOfferedJobs(ctx);
		expect(everything.length).toBeGreaterThan(50);
		const view = `${String(centre.lng - 0.2)},${String(centre.lat - 0.15)},${String(centre.lng + 0.25)},${String(centre.lat + 0.1)}`;
		for (const zoom of [3, 8, 10, 12, 15, 18]) {
			for (const bounds of [undefined, view]) {
				const page = await searchBoard(
					ctx,
					boardQuerySchema.parse({ zoom: String(zoom), bounds, limit: '5' })
				);
				const clusters = page!.clusters!;
				expect(clusters.length).toBeLessThanOrEqual((MAX_CLUSTER_CELLS_ACROSS + 1) ** 2);
				const sum = clusters.reduce((n, c) => n + c.count, 0);
				expect(sum).toBe(page!.total);
				const expected = bounds
					? (await listOfferedJobs(ctx, boardQuerySchema.parse({ bounds }).bounds)).length
					: everything.length;
				expect(sum).toBe(expected);
				for (const c of clusters) expect(c.job === null).toBe(c.count > 1);
			}
		}
		const counted = await searchBoard(ctx, boardQuerySchema.parse({}));
		expect(counted!.total).toBe(everything.length);
	});
});

describe('live quote counts', () => {
	it('follow every quote insert, status change and delete in the same transaction', async () => {
		const [row] = await insertJobs(randomJobs(mulberry32(5), { lat: -50, lng: 150 }, 1, 0));
		const installers = await Promise.all([1, 2, 3].map(() => makeInstaller()));
		const count = async () =>
			(await db.execute<{ n: number }>(sql`select live_quotes as n from job where id = ${row!.id}`))
				.rows[0]!.n;
		const made = await db
			.insert(quote)
			.values(installers.map((i) => ({ jobId: row!.id, installerId: i.id, totalCents: 1000 })))
			.returning({ id: quote.id });
		expect(await count()).toBe(3);
		await db.execute(sql`update quote set status = 'withdrawn' where id = ${made[0]!.id}`);
		expect(await count()).toBe(2);
		// A revision that stays live changes nothing.
		await db.execute(sql`update quote set total_cents = 2000 where id = ${made[1]!.id}`);
		expect(await count()).toBe(2);
		await db.execute(sql`update quote set status = 'live' where id = ${made[0]!.id}`);
		expect(await count()).toBe(3);
		await db
			.transaction(async (tx) => {
				await tx.execute(sql`delete from quote where id = ${made[2]!.id}`);
				tx.rollback();
			})
			.catch(() => undefined);
		expect(await count()).toBe(3);
		await db.execute(sql`delete from quote where id = ${made[2]!.id}`);
		expect(await count()).toBe(2);
	});
});

describe('privacy', () => {
	it('never puts a true point in anything an installer is sent before booking', async () => {
		// True points with distinctive digits, away from their cell centres.
		const truePoints = [
			{ lat: -51.123457, lng: 141.987653 },
			{ lat: -51.131113, lng: 142.011119 },
			{ lat: -51.2, lng: 142.2 }
		];
		const rows = await insertJobs(
			truePoints.map((at) => ({
				at,
				bodyStyle: 'sedan',
				cameras: 'front',
				power: 'socket',
				locationMode: 'mobile'
			}))
		);
		const { id } = await makeInstaller({ base: { lat: -51.1, lng: 142 }, radiusKm: 40 });
		const ctx: InstallerContext = await context(id);
		const answers = [
			await searchBoard(ctx, boardQuerySchema.parse({})),
			await searchBoard(ctx, boardQuerySchema.parse({ zoom: '18' })),
			await searchBoard(ctx, boardQuerySchema.parse({ zoom: '4', sort: 'newest' })),
			await listNewOfferedJobs(ctx, { counted: true }),
			...(await Promise.all(rows.map((r) => getJobForInstaller(r.id, ctx))))
		];
		const text = JSON.stringify(answers);
		expect(text).toContain(rows[0]!.id);
		for (const p of truePoints) {
			// Any rendering of the coordinates to 4 decimals or more (about 10 m) would show here.
			for (const digits of [4, 5, 6]) {
				expect(text).not.toContain(p.lat.toFixed(digits));
				expect(text).not.toContain(p.lng.toFixed(digits));
			}
		}
		expect(text).not.toContain('Secret Street');
	});

	it('e-mails the digest set-based, once per installer and job', async () => {
		const far = { lat: -52.5, lng: 160 };
		const rows = await insertJobs(randomJobs(mulberry32(11), far, 6, 0.1));
		const { id, email } = await makeInstaller({ base: far, radiusKm: 30 });
		const ctx = await context(id);
		const offered = await listOfferedJobs(ctx);
		expect(ids(offered)).toEqual(ids(rows));
		for (const r of rows) {
			expect((await findInstallersForJob(r)).map((i) => i.id)).toEqual([id]);
		}
		await sendNewJobDigests();
		const notices = await db.execute<{ job_id: string }>(
			sql`select job_id from job_notice where installer_id = ${id}`
		);
		expect(notices.rows.map((r) => r.job_id).sort()).toEqual(ids(offered));
		await sendNewJobDigests();
		const mails = await db.execute<{ n: number }>(
			sql`select count(*)::int as n from email_outbox where to_address = ${email} and template = 'new-jobs-digest'`
		);
		expect(mails.rows[0]!.n).toBe(1);
	});
});

describe('new jobs this week', () => {
	it('lists the unquoted jobs posted in the last week, newest first, with their number', async () => {
		const at = { lat: -53.5, lng: 165 };
		const now = new Date();
		const days = (n: number) => new Date(now.getTime() - n * 86_400_000);
		const spec = (submittedAt: Date): JobSpec => ({
			at,
			bodyStyle: 'sedan',
			cameras: 'front',
			power: 'socket',
			locationMode: 'mobile',
			submittedAt
		});
		const [older, recent, newest, quoted] = await insertJobs([
			spec(days(9)),
			spec(days(3)),
			spec(days(1)),
			spec(days(2))
		]);
		const { id } = await makeInstaller({ base: at, radiusKm: 10 });
		await db.insert(quote).values({ jobId: quoted!.id, installerId: id, totalCents: 20000 });
		const ctx = await context(id);
		const all = await listNewOfferedJobs(ctx, { counted: true, now });
		expect(all.jobs.map((j) => j.id)).toEqual([newest!.id, recent!.id]);
		expect(all.total).toBe(2);
		expect(all.jobs.map((j) => j.id)).not.toContain(older!.id);
		const one = await listNewOfferedJobs(ctx, { limit: 1, counted: true, now });
		expect(one.jobs.map((j) => j.id)).toEqual([newest!.id]);
		expect(one.total).toBe(2);
	});
});

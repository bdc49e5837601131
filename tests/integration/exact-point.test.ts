// Issue 11, item 1: whether a job is offered, and whether the map's bounds hold it, goes by its
// ~1 km grid-cell centre, so an installer moving their pin, radius or map learns nothing finer
// than the cell about where the owner is.
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { installerProfile, vettingEvent } from '$lib/server/db/schema';
import { saveServiceArea, SERVICE_AREA_MOVES_PER_DAY } from '$lib/server/people/installers';
import { distanceKm, snapToGrid, type LatLng } from '$lib/geo';
import {
	getInstallerContext,
	getJobForInstaller,
	listOfferedJobs
} from '$lib/server/marketplace/matching';
import { makeInstaller, makeOpenJob } from './matching-helpers';

// A cell in an empty stretch of the gulf, so no other test's jobs are near.
const CELL = snapToGrid({ lat: -35.31, lng: 138.21 });
const centre: LatLng = { lat: CELL.lat, lng: CELL.lng };
// Points near the cell's west and east edges (a 1 km cell is ≈ 0.009° of latitude and ≈ 0.011°
// of longitude here; from the grid's definition in geo.ts).
const WEST: LatLng = { lat: centre.lat, lng: centre.lng - 0.005 };
const EAST: LatLng = { lat: centre.lat, lng: centre.lng + 0.005 };

describe('offering by grid cell, not by exact point', () => {
	it('gives every point of one cell the same answer on the board and the job page', async () => {
		expect(snapToGrid(WEST).cellId).toBe(CELL.cellId);
		expect(snapToGrid(EAST).cellId).toBe(CELL.cellId);
		const west = await makeOpenJob(WEST);
		const east = await makeOpenJob(EAST);
		// A base 4.9 km east of the centre with a 5 km radius: the circle's edge runs through the
		// cell, leaving the west point outside it and the east point inside.
		const base: LatLng = {
			lat: centre.lat,
			lng: centre.lng + 4.9 / (111.32 * Math.cos((centre.lat * Math.PI) / 180))
		};
		expect(distanceKm(base, centre)).toBeLessThan(5);
		expect(distanceKm(base, WEST)).toBeGreaterThan(5);
		const installer = await makeInstaller({ base, radiusKm: 5 });
		const ctx = (await getInstallerContext(installer.id))!;
		const board = (await listOfferedJobs(ctx)).map((j) => j.id);
		expect(board).toContain(west.job.id);
		expect(board).toContain(east.job.id);
		expect(await getJobForInstaller(west.job.id, ctx)).not.toBeNull();
		expect(await getJobForInstaller(east.job.id, ctx)).not.toBeNull();
	});

	it('cuts the map by the cell centre, so the bounds cannot find the exact point', async () => {
		const made = await makeOpenJob(WEST);
		const installer = await makeInstaller({ base: centre, radiusKm: 10 });
		const ctx = (await getInstallerContext(installer.id))!;
		const listed = async (minLng: number, maxLng: number) =>
			(
				await listOfferedJobs(ctx, {
					minLat: centre.lat - 0.001,
					maxLat: centre.lat + 0.001,
					minLng,
					maxLng
				})
			).some((j) => j.id === made.job.id);
		// Bounds holding the centre but not the exact point: listed.
		expect(await listed(centre.lng - 0.001, centre.lng + 0.001)).toBe(true);
		// Bounds holding the exact point but not the centre: not listed.
		expect(await listed(WEST.lng - 0.001, WEST.lng + 0.001)).toBe(false);
	});

	it('records each service-area move as a vetting event and allows three a day', async () => {
		const installer = await makeInstaller({ base: centre, radiusKm: 10 });
		const move = (lng: number, serviceRadiusKm = 10) =>
			saveServiceArea(installer.id, {
				latitude: centre.lat,
				longitude: lng,
				serviceRadiusKm,
				freeRadiusKm: 5,
				travelFeeCentsPerKm: 100,
				place: null
			});
		// Saving the same place and radius again (fees only) is not a move.
		expect((await move(centre.lng)).ok).toBe(true);
		for (let i = 1; i <= SERVICE_AREA_MOVES_PER_DAY; i++) {
			expect((await move(centre.lng + i * 0.01)).ok).toBe(true);
		}
		expect(await move(centre.lng + 0.5, 1)).toMatchObject({ ok: false, status: 429 });
		const events = await db
			.select({ action: vettingEvent.action })
			.from(vettingEvent)
			.where(eq(vettingEvent.installerId, installer.id));
		expect(events.filter((e) => e.action === 'service-area-moved')).toHaveLength(
			SERVICE_AREA_MOVES_PER_DAY
		);
		const [profile] = await db
			.select({ lng: installerProfile.longitude })
			.from(installerProfile)
			.where(eq(installerProfile.userId, installer.id));
		expect(profile?.lng).toBeCloseTo(centre.lng + SERVICE_AREA_MOVES_PER_DAY * 0.01, 9);
	});
});

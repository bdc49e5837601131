import { count, eq } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { installerProfile, user } from '$lib/server/db/schema';
import { seedDemo } from '../../seed';
import { DEMO_INSTALLERS } from '../../seed/scenario';
import { startDemoWorld } from './demo-world';

let stop: () => Promise<void>;
beforeAll(async () => {
	stop = await startDemoWorld();
});
afterAll(() => stop());

describe('demo seed', () => {
	it('loads one admin, the owners and a dozen installers around Adelaide, once', async () => {
		const url = process.env.DATABASE_URL as string;
		expect(await seedDemo(url)).toBe(true);
		const roles = await db.select({ role: user.role, n: count() }).from(user).groupBy(user.role);
		const byRole = Object.fromEntries(roles.map((r) => [r.role, r.n]));
		expect(byRole).toEqual({ admin: 1, owner: 4, installer: DEMO_INSTALLERS.length });
		expect(DEMO_INSTALLERS.length).toBe(12);

		// Greater Adelaide lies within roughly 34.5–35.4° S and 138.4–139.0° E (from memory; any
		// Australian road atlas).
		const places = await db.select().from(installerProfile);
		for (const p of places) {
			expect(p.latitude).toBeGreaterThan(-35.4);
			expect(p.latitude).toBeLessThan(-34.5);
			expect(p.longitude).toBeGreaterThan(138.4);
			expect(p.longitude).toBeLessThan(139.0);
			expect(p.postcode).toMatch(/^5\d{3}$/); // South Australian postcodes start with 5
		}
		const [demo] = await db
			.select({ status: installerProfile.vettingStatus })
			.from(installerProfile)
			.innerJoin(user, eq(user.id, installerProfile.userId))
			.where(eq(user.email, 'demo.installer@tapline.test'));
		expect(demo?.status).toBe('approved');

		expect(await seedDemo(url)).toBe(false);
		const [again] = await db.select({ n: count() }).from(user);
		expect(again?.n).toBe(1 + 4 + 12);
	});
});

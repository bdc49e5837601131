/**
 * Loads the demo scenario into an empty database (`npm run db:seed`; `npm start` runs it).
 * Does nothing when any account exists, so it never overwrites real or earlier data.
 */
import { count } from 'drizzle-orm';
import { drizzle } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import { installerProfile, user } from '../src/lib/server/db/schema';
import { hashPassword } from '../src/lib/server/password';
import { DEMO_ADMIN, DEMO_INSTALLERS, DEMO_OWNERS, DEMO_PASSWORD, suburbPoint } from './scenario';

/** Inserts the scenario in one transaction; returns false when the database already had accounts. */
export async function seedDemo(databaseUrl: string): Promise<boolean> {
	const pool = new pg.Pool({ connectionString: databaseUrl, max: 2 });
	const db = drizzle(pool);
	try {
		const [existing] = await db.select({ n: count() }).from(user);
		if ((existing?.n ?? 0) > 0) return false;
		const passwordHash = await hashPassword(DEMO_PASSWORD);
		const verified = new Date();
		await db.transaction(async (tx) => {
			await tx.insert(user).values([
				{
					id: crypto.randomUUID(),
					...DEMO_ADMIN,
					role: 'admin',
					passwordHash,
					emailVerifiedAt: verified
				},
				...DEMO_OWNERS.map((o) => ({
					id: crypto.randomUUID(),
					...o,
					role: 'owner' as const,
					passwordHash,
					emailVerifiedAt: verified
				}))
			]);
			for (const i of DEMO_INSTALLERS) {
				const id = crypto.randomUUID();
				const point = suburbPoint(i.suburb);
				await tx.insert(user).values({
					id,
					email: i.email,
					displayName: i.displayName,
					role: 'installer',
					passwordHash,
					emailVerifiedAt: verified
				});
				await tx.insert(installerProfile).values({
					userId: id,
					businessName: i.businessName,
					suburb: point.name,
					postcode: point.postcode,
					latitude: point.lat,
					longitude: point.lon,
					serviceRadiusKm: i.radiusKm,
					offersMobile: i.mobile,
					offersWorkshop: i.workshop,
					vettingStatus: i.status
				});
			}
		});
		return true;
	} finally {
		await pool.end();
	}
}

if (import.meta.url === `file://${process.argv[1]}`) {
	const url = process.env.DATABASE_URL;
	if (!url) throw new Error('DATABASE_URL is not set');
	const seeded = await seedDemo(url);
	console.log(seeded ? 'Demo scenario loaded.' : 'Accounts exist already: demo seed skipped.');
}

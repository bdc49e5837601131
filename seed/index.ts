/**
 * Loads the demo scenario into an empty database (`npm run db:seed`; `npm start` runs it).
 * Does nothing when any account exists, so it never overwrites real or earlier data.
 */
import { count } from 'drizzle-orm';
import { drizzle } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import {
	installerDocument,
	installerHours,
	installerProfile,
	user,
	vettingEvent
} from '../src/lib/server/db/schema';
import { hashPassword } from '../src/lib/server/people/password';
import { DEMO_CONNECTED_ACCOUNTS } from '../local-fakes/data/stripe-demo-accounts';
import { demoDocumentFiles, storeDemoObjects, type DemoObject } from './documents';
import { seedDemoJobs } from './jobs';
import { seedDemoStory } from './story';
import {
	DEMO_ADMIN,
	DEMO_INSTALLERS,
	DEMO_OWNERS,
	DEMO_PASSWORD,
	demoInstallerDetails,
	demoVettingDocuments,
	demoWeeklyHours,
	suburbPoint
} from './scenario';

/** How long ago the demo accounts opened: before the oldest backdated booking (about 12 weeks). */
const ACCOUNTS_AGE_DAYS = 150;

const ALL_TICKED = { identityMatches: true, insuranceCurrent: true, abnValidAndActive: true };

/** The demo connected account of the installer at `index` in the scenario. */
function demoPayoutAccount(index: number): string {
	const account = DEMO_CONNECTED_ACCOUNTS[index];
	if (!account) throw new Error(`No demo connected account for installer ${String(index)}`);
	return account.id;
}

/**
 * Inserts the people and open jobs of the scenario in one transaction, stores the demo installers'
 * documents in the object store, then plays the bookings through the product (seed/story.ts: it
 * needs the payments fake and the object store). Returns false when the database already had
 * accounts. The accounts date from five months back, so the backdated history has people to it.
 */
export async function seedDemo(databaseUrl: string): Promise<boolean> {
	const pool = new pg.Pool({ connectionString: databaseUrl, max: 2 });
	const db = drizzle(pool);
	try {
		const [existing] = await db.select({ n: count() }).from(user);
		if ((existing?.n ?? 0) > 0) return false;
		const passwordHash = await hashPassword(DEMO_PASSWORD);
		const files = await demoDocumentFiles();
		const sizes = { insurance: files.insurance.byteLength, photoId: files.photoId.byteLength };
		const objects: DemoObject[] = [];
		const today = new Date();
		const verified = new Date(today.getTime() - ACCOUNTS_AGE_DAYS * 86_400_000);
		const adminId = crypto.randomUUID();
		await db.transaction(async (tx) => {
			await tx.insert(user).values([
				{
					id: adminId,
					...DEMO_ADMIN,
					role: 'admin',
					passwordHash,
					emailVerifiedAt: verified,
					createdAt: verified
				},
				...DEMO_OWNERS.map((o) => ({
					id: crypto.randomUUID(),
					...o,
					role: 'owner' as const,
					passwordHash,
					emailVerifiedAt: verified,
					createdAt: verified
				}))
			]);
			for (const [index, i] of DEMO_INSTALLERS.entries()) {
				const id = crypto.randomUUID();
				const details = demoInstallerDetails(index, today);
				// Vetted installers applied months ago, before their first fits; the rest wait in the
				// queue since the last fortnight.
				const vetted = i.status === 'approved' || i.status === 'suspended';
				const submittedAt = vetted
					? new Date(verified.getTime() + (index + 1) * 86_400_000)
					: new Date(today.getTime() - (index + 1) * 86_400_000);
				const point = suburbPoint(i.suburb);
				await tx.insert(user).values({
					id,
					email: i.email,
					displayName: i.displayName,
					role: 'installer',
					passwordHash,
					emailVerifiedAt: verified,
					createdAt: verified
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
					vettingStatus: i.status,
					submittedAt,
					// Vetted installers quote, and quoting needs payouts: each has one of the connected
					// accounts the payments fake holds already onboarded.
					...(i.status === 'approved' || i.status === 'suspended'
						? {
								payoutAccountId: demoPayoutAccount(index),
								payoutsEnabled: true
							}
						: {}),
					...details
				});
				await tx
					.insert(installerHours)
					.values(demoWeeklyHours(index).map((h) => ({ installerId: id, ...h })));
				// Every demo application was sent, so each has what sending requires.
				const documents = demoVettingDocuments(id, sizes);
				await tx
					.insert(installerDocument)
					.values(documents.map((d) => ({ ...d, installerId: id })));
				for (const d of documents) {
					objects.push({
						objectKey: d.objectKey,
						contentType: d.contentType,
						body: d.kind === 'insurance' ? files.insurance : files.photoId
					});
				}
				await tx.insert(vettingEvent).values(demoTrail(id, adminId, i.status, submittedAt));
			}
		});
		await seedDemoJobs(db, today);
		const stored = await storeDemoObjects(objects);
		if (stored === null) {
			throw new Error(
				'S3_ENDPOINT is not set: the demo stores documents and photos in the object store, so start the fakes first (npm run fakes).'
			);
		}
		await seedDemoStory(today);
		return true;
	} finally {
		await pool.end();
	}
}

/** The audit trail that leads to each demo installer's standing. */
function demoTrail(
	installerId: string,
	adminId: string,
	status: (typeof DEMO_INSTALLERS)[number]['status'],
	submittedAt: Date
) {
	const later = (days: number) => new Date(submittedAt.getTime() + days * 86_400_000);
	const submit = {
		installerId,
		actorId: installerId,
		action: 'submit',
		fromStatus: null,
		toStatus: 'applied' as const,
		createdAt: submittedAt
	};
	const approve = {
		installerId,
		actorId: adminId,
		action: 'approve',
		fromStatus: 'applied' as const,
		toStatus: 'approved' as const,
		checklist: ALL_TICKED,
		reason: 'ABN active on the register; certificate and ID match.',
		createdAt: later(2)
	};
	switch (status) {
		case 'approved':
			return [submit, approve];
		case 'suspended':
			return [
				submit,
				approve,
				{
					installerId,
					actorId: adminId,
					action: 'suspend',
					fromStatus: 'approved' as const,
					toStatus: 'suspended' as const,
					reason: 'Two owners reported unfinished fits; suspended while we talk it through.',
					createdAt: later(20)
				}
			];
		case 'waiting_on_installer':
			return [
				submit,
				{
					installerId,
					actorId: adminId,
					action: 'request-info',
					fromStatus: 'applied' as const,
					toStatus: 'waiting_on_installer' as const,
					reason: 'The photo ID is blurred; please upload a clearer photo.',
					createdAt: later(1)
				}
			];
		default:
			return [submit];
	}
}

/** `npm run db:seed` (through scripts/run-ts.mjs): loads the scenario into DATABASE_URL. */
export async function main(): Promise<void> {
	const url = process.env.DATABASE_URL;
	if (!url) throw new Error('DATABASE_URL is not set');
	const seeded = await seedDemo(url);
	console.log(seeded ? 'Demo scenario loaded.' : 'Accounts exist already: demo seed skipped.');
}

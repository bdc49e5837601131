import { eq, inArray } from 'drizzle-orm';
import { PDFDocument } from 'pdf-lib';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { getObject } from '$lib/server/files/storage';
import { getMarketSettings } from '$lib/server/money/settings';
import { installerDocument, installerHours, installerProfile } from '$lib/server/db/schema';
import {
	approvalProblems,
	localDate,
	missingParts,
	type Checklist,
	type DocumentKind
} from '$lib/people/vetting';
import { seedDemo } from '../../seed';
import { DEMO_CONNECTED_ACCOUNTS } from '../../local-fakes/data/stripe-demo-accounts';
import { startDemoWorld } from './demo-world';

// The admin's ticks are judgement, recorded in the seed's approval events as all ticked.
const ALL_TICKED: Checklist = {
	identityMatches: true,
	insuranceCurrent: true,
	abnValidAndActive: true
};

let stop: () => Promise<void>;
beforeAll(async () => {
	// The seed stores the demo documents through the S3 API and pays on the payments fake, as under
	// npm start.
	stop = await startDemoWorld();
});
afterAll(() => stop());

describe('the demo data obeys the vetting rules', () => {
	it('every vetted installer has what sending and approving an application require', async () => {
		expect(await seedDemo(process.env.DATABASE_URL as string)).toBe(true);
		const today = localDate(new Date(), 'Australia/Adelaide');
		const vetted = await db
			.select()
			.from(installerProfile)
			.where(inArray(installerProfile.vettingStatus, ['approved', 'suspended']));
		expect(vetted.length).toBeGreaterThan(0);
		for (const profile of vetted) {
			const docs = await db
				.select({ kind: installerDocument.kind })
				.from(installerDocument)
				.where(eq(installerDocument.installerId, profile.userId));
			const documentKinds = docs.map((d) => d.kind as DocumentKind);
			const hours = await db
				.select({ weekday: installerHours.weekday })
				.from(installerHours)
				.where(eq(installerHours.installerId, profile.userId));
			const name = profile.businessName;
			expect(
				missingParts({
					hasProfile: true,
					abn: profile.abn,
					phone: profile.phone,
					skills: profile.skills,
					insurer: profile.insurer,
					insuranceExpiresOn: profile.insuranceExpiresOn,
					coverCents: profile.coverCents,
					documentKinds,
					hoursCount: hours.length
				}),
				name
			).toEqual([]);
			expect(
				approvalProblems(ALL_TICKED, {
					coverCents: profile.coverCents,
					insuranceExpiresOn: profile.insuranceExpiresOn,
					documentKinds,
					today,
					minCoverCents: (await getMarketSettings()).minPublicLiabilityCents
				}),
				name
			).toEqual([]);
		}
	});

	it('every application that was sent has an insurance certificate and photo ID', async () => {
		const sent = await db
			.select({ id: installerProfile.userId, name: installerProfile.businessName })
			.from(installerProfile)
			.where(inArray(installerProfile.vettingStatus, ['applied', 'waiting_on_installer']));
		for (const { id, name } of sent) {
			const kinds = (
				await db
					.select({ kind: installerDocument.kind })
					.from(installerDocument)
					.where(eq(installerDocument.installerId, id))
			).map((d) => d.kind);
			expect(kinds, name).toEqual(expect.arrayContaining(['insurance', 'photo-id']));
		}
	});

	it('every approved installer can be paid: a demo connected account the payments fake holds, payouts enabled', async () => {
		const approved = await db
			.select()
			.from(installerProfile)
			.where(eq(installerProfile.vettingStatus, 'approved'));
		expect(approved.length).toBeGreaterThan(0);
		const known = new Set(DEMO_CONNECTED_ACCOUNTS.map((a) => a.id));
		for (const profile of approved) {
			expect(profile.payoutsEnabled, profile.businessName).toBe(true);
			expect(known.has(profile.payoutAccountId ?? ''), profile.businessName).toBe(true);
		}
		const unvetted = await db
			.select({ enabled: installerProfile.payoutsEnabled })
			.from(installerProfile)
			.where(
				inArray(installerProfile.vettingStatus, ['applied', 'waiting_on_installer', 'rejected'])
			);
		expect(unvetted.every((p) => !p.enabled)).toBe(true);
	});

	it('every listed document is stored, with the size its row gives, and opens', async () => {
		const documents = await db.select().from(installerDocument);
		expect(documents.length).toBeGreaterThan(0);
		for (const d of documents) {
			const stored = await getObject(d.objectKey);
			expect(stored, d.objectKey).not.toBeNull();
			const bytes = new Uint8Array(await new Response(stored!.body).arrayBuffer());
			expect(bytes.byteLength, d.objectKey).toBe(d.bytes);
			if (d.contentType === 'application/pdf') {
				const pdf = await PDFDocument.load(bytes);
				expect(pdf.getTitle()).toContain('invented');
			} else {
				expect((await sharp(bytes).metadata()).format).toBe('jpeg');
			}
		}
	});
});

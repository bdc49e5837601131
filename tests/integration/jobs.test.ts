import { UNTITLED_JOB } from '$lib/marketplace/posted-job';
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { installerProfile, job, quote, user } from '$lib/server/db/schema';
import {
	createDraftJob,
	getOwnedJob,
	listOwnerJobs,
	postJob,
	saveJobStep,
	setJobPhoto,
	withdrawJob
} from '$lib/server/marketplace/jobs';

const NORWOOD = { lat: -34.9213, lng: 138.6301 };

async function makeUser(role: 'owner' | 'installer') {
	const id = crypto.randomUUID();
	await db.insert(user).values({
		id,
		email: `${role}.${id}@example.test`,
		passwordHash: 'x',
		role,
		displayName: role,
		emailVerifiedAt: new Date()
	});
	return id;
}

/** Tomorrow and the day after as local dates, far from any boundary of the 90-day window. */
const inDays = (n: number) => new Date(Date.now() + n * 86_400_000).toISOString().slice(0, 10);

async function fillDraft(jobId: string, ownerId: string) {
	await saveJobStep(jobId, ownerId, 'vehicle', {
		make: 'Demo',
		model: 'Wagon',
		year: '2019',
		bodyStyle: 'wagon',
		fuseFamily: 'mini',
		batteryType: 'flooded',
		batteryAh: 60,
		startStop: false,
		hybridOrEv: false,
		curtainAirbags: 'yes'
	});
	await saveJobStep(jobId, ownerId, 'cameras', {
		cameras: 'front-rear',
		cameraSupply: 'owner',
		removeOldUnit: false
	});
	await saveJobStep(jobId, ownerId, 'power', { power: 'hardwired-parking' });
	await saveJobStep(
		jobId,
		ownerId,
		'place',
		{},
		{
			locationMode: 'workshop',
			suburb: 'Norwood',
			postcode: '5067',
			latitude: NORWOOD.lat,
			longitude: NORWOOD.lng,
			preferredWindows: [{ date: inDays(3), window: 'morning' }]
		}
	);
}

describe('job drafts', () => {
	it('keeps every step in the draft and posts with a computed scope sheet', async () => {
		const owner = await makeUser('owner');
		const id = await createDraftJob(owner);
		await fillDraft(id, owner);
		expect(await postJob(id, owner)).toEqual({ ok: true });
		const posted = await getOwnedJob(id, owner);
		expect(posted?.status).toBe('collecting_quotes');
		expect(posted?.title).toBe('2019 Demo Wagon');
		expect(posted?.bodyStyle).toBe('wagon');
		// Parking mode needs two fuse taps, one switched and one permanent (common trade practice).
		const taps = posted?.scope?.parts.find((p) => p.code === 'fuse-tap-mini');
		expect(taps?.quantity).toBe(2);
		const budget = posted?.scope?.parking?.budget;
		expect(budget?.estimated && budget.hours).toBeGreaterThan(0);
		expect(posted?.priceLowCents).toBe(posted?.scope?.price.totalIncGst.min);
		expect(posted?.submittedAt).toBeInstanceOf(Date);
	});

	it('refuses to post an incomplete draft, says which step to fix, and changes nothing', async () => {
		const owner = await makeUser('owner');
		const id = await createDraftJob(owner);
		await saveJobStep(id, owner, 'vehicle', { make: 'Demo' });
		const result = await postJob(id, owner);
		expect(result.ok).toBe(false);
		expect(!result.ok && result.status).toBe(400);
		const steps = Object.keys((!result.ok && result.fields) || {});
		expect(steps).toEqual(expect.arrayContaining(['vehicle', 'cameras', 'place']));
		const [row] = await db.select().from(job).where(eq(job.id, id));
		expect(row?.status).toBe('drafting');
		expect(row?.scope).toBeNull();
	});

	it('refuses preferred dates in the past at posting time', async () => {
		const owner = await makeUser('owner');
		const id = await createDraftJob(owner);
		await fillDraft(id, owner);
		await db
			.update(job)
			.set({ preferredWindows: [{ date: '2020-01-01', window: 'morning' }] })
			.where(eq(job.id, id));
		const result = await postJob(id, owner);
		expect(result).toMatchObject({
			ok: false,
			status: 400,
			fields: { place: 'Preferred dates: choose a date after today' }
		});
	});

	it("never lets one owner read or change another owner's job", async () => {
		const owner = await makeUser('owner');
		const stranger = await makeUser('owner');
		const id = await createDraftJob(owner);
		expect(await getOwnedJob(id, stranger)).toBeNull();
		expect(await saveJobStep(id, stranger, 'vehicle', { make: 'Hijack' })).toMatchObject({
			ok: false,
			status: 404
		});
		expect(await withdrawJob(id, stranger, 'not mine')).toMatchObject({ ok: false, status: 404 });
		expect(await getOwnedJob(crypto.randomUUID(), owner)).toBeNull();
		const [row] = await db.select().from(job).where(eq(job.id, id));
		expect(row?.draft).toEqual({});
	});

	it('locks the details once a quote is in, but still allows withdrawing', async () => {
		const owner = await makeUser('owner');
		const installer = await makeUser('installer');
		await db.insert(installerProfile).values({
			userId: installer,
			businessName: 'Test Fits',
			suburb: 'Norwood',
			postcode: '5067',
			latitude: NORWOOD.lat,
			longitude: NORWOOD.lng
		});
		const id = await createDraftJob(owner);
		await fillDraft(id, owner);
		await postJob(id, owner);
		await db.insert(quote).values({ jobId: id, installerId: installer, totalCents: 45_000 });
		expect(await saveJobStep(id, owner, 'vehicle', { make: 'Changed' })).toMatchObject({
			ok: false,
			status: 409
		});
		expect(await postJob(id, owner)).toMatchObject({ ok: false, status: 409 });
		expect((await getOwnedJob(id, owner))?.editable).toBe(false);
		expect(await withdrawJob(id, owner, 'Sold the car')).toEqual({ ok: true });
		const [row] = await db.select().from(job).where(eq(job.id, id));
		expect(row?.status).toBe('withdrawn');
		expect(row?.withdrawnReason).toBe('Sold the car');
		expect(await withdrawJob(id, owner, 'again')).toMatchObject({ ok: false, status: 409 });
	});

	it('lists an owner’s jobs with quote counts, sorted and paginated', async () => {
		const owner = await makeUser('owner');
		const ids: string[] = [];
		for (let i = 0; i < 12; i++) ids.push(await createDraftJob(owner));
		const firstPage = await listOwnerJobs(owner, {
			sort: 'created',
			dir: 'desc',
			page: 1,
			pageSize: 10
		});
		expect(firstPage.total).toBe(12);
		expect(firstPage.rows).toHaveLength(10);
		const secondPage = await listOwnerJobs(owner, {
			sort: 'created',
			dir: 'desc',
			page: 2,
			pageSize: 10
		});
		expect(secondPage.rows).toHaveLength(2);
		const all = [...firstPage.rows, ...secondPage.rows].map((r) => r.id);
		expect(new Set(all).size).toBe(12);
		expect(firstPage.rows.every((r) => r.title === UNTITLED_JOB && r.quotes === 0)).toBe(true);
		const other = await makeUser('owner');
		expect(
			(await listOwnerJobs(other, { sort: 'quotes', dir: 'asc', page: 1, pageSize: 10 })).total
		).toBe(0);
	});

	it('replaces a photo of the same kind, reports the displaced objects, and guards ownership', async () => {
		const owner = await makeUser('owner');
		const stranger = await makeUser('owner');
		const id = await createDraftJob(owner);
		const photo = (n: number) => ({
			objectKey: `k${n}.jpg`,
			thumbKey: `k${n}-t.jpg`,
			width: 10,
			height: 10,
			bytes: 100
		});
		expect(await setJobPhoto(id, owner, 'fuse-box', photo(1))).toEqual({ ok: true, displaced: [] });
		expect(await setJobPhoto(id, owner, 'fuse-box', photo(2))).toEqual({
			ok: true,
			displaced: ['k1.jpg', 'k1-t.jpg']
		});
		expect(await setJobPhoto(id, stranger, 'fuse-box')).toMatchObject({ ok: false, status: 404 });
		expect(await setJobPhoto(id, owner, 'fuse-box')).toEqual({
			ok: true,
			displaced: ['k2.jpg', 'k2-t.jpg']
		});
		expect(await setJobPhoto(id, owner, 'fuse-box')).toEqual({ ok: true, displaced: [] });
	});
});

import { and, eq, sql } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import { emailOutbox, installerProfile, vettingEvent } from '$lib/server/db/schema';
import {
	decideApplication,
	listVettingQueue,
	type DecisionInput
} from '$lib/server/people/vetting';
import { findViewableDocument } from '$lib/server/people/documents';
import {
	getPublicProfile,
	saveApplication,
	submitApplication
} from '$lib/server/people/installers';
import {
	addDocument,
	ALL_TICKED,
	makeAccount,
	makeApplicant,
	makeCompleteDraft,
	NONE_TICKED,
	NORWOOD,
	VALID_ABN
} from './vetting-helpers';

async function profileOf(id: string) {
	const [row] = await db.select().from(installerProfile).where(eq(installerProfile.userId, id));
	return row;
}

const eventsOf = (id: string) =>
	db.select().from(vettingEvent).where(eq(vettingEvent.installerId, id));

const mailsTo = (to: string) =>
	db
		.select({ template: emailOutbox.template, text: emailOutbox.text })
		.from(emailOutbox)
		.where(eq(emailOutbox.toAddress, to));

describe('application and submission', () => {
	it('creates the profile on first save and refuses to send an incomplete application', async () => {
		const installer = await makeAccount('installer');
		const draft = {
			businessName: 'Half Done Fitting',
			contactName: 'Sam',
			phone: '0412345678',
			abn: VALID_ABN,
			gstRegistered: true,
			yearsInTrade: 2,
			skills: ['parking-mode'],
			offersMobile: true,
			offersWorkshop: false,
			workshopAddress: null
		};
		expect(await saveApplication(installer.id, draft, null)).toMatchObject({
			ok: false,
			status: 400
		});
		expect(await profileOf(installer.id)).toBeUndefined();
		expect(await saveApplication(installer.id, draft, NORWOOD)).toEqual({ ok: true });
		const row = await profileOf(installer.id);
		expect(row?.suburb).toBe('Norwood');
		expect(row?.submittedAt).toBeNull();

		const refused = await submitApplication(installer.id);
		expect(refused).toMatchObject({ ok: false, status: 400 });
		expect(!refused.ok && refused.message).toMatch(/insurance certificate.*Photo ID/i);
		expect(await eventsOf(installer.id)).toHaveLength(0);
	});

	it('sends a complete application once, records it and queues the receipt', async () => {
		const installer = await makeCompleteDraft();
		const sent = await submitApplication(installer.id);
		expect(sent.ok).toBe(true);
		const row = await profileOf(installer.id);
		expect(row?.vettingStatus).toBe('applied');
		expect(row?.submittedAt).toBeInstanceOf(Date);
		const events = await eventsOf(installer.id);
		expect(events.map((e) => [e.action, e.fromStatus, e.toStatus])).toEqual([
			['submit', null, 'applied']
		]);
		expect((await mailsTo(installer.email)).map((m) => m.template)).toEqual(['vetting-received']);

		expect(await submitApplication(installer.id)).toMatchObject({ ok: false, status: 409 });
		// While an admin looks at it, the installer cannot change it.
		expect(
			await saveApplication(
				installer.id,
				{
					businessName: 'Renamed',
					contactName: 'x',
					phone: '0412345678',
					abn: VALID_ABN,
					gstRegistered: true,
					yearsInTrade: 1,
					skills: ['parking-mode'],
					offersMobile: true,
					offersWorkshop: false,
					workshopAddress: null
				},
				null
			)
		).toMatchObject({ ok: false, status: 409 });
	});
});

describe('decisions', () => {
	const decide = (over: Partial<DecisionInput> & Pick<DecisionInput, 'installerId' | 'adminId'>) =>
		decideApplication({
			decision: 'approve',
			expectedStatus: 'applied',
			message: null,
			checklist: ALL_TICKED,
			...over
		});

	it('refuses illegal transitions and leaves no trace of them', async () => {
		const admin = await makeAccount('admin');
		const installer = await makeApplicant();
		const attempts: Array<Partial<DecisionInput>> = [
			{ decision: 'suspend', message: 'no' }, // not approved yet
			{ decision: 'reinstate' }, // not suspended
			{ decision: 'approve-insurance' }, // not paused
			{ decision: 'approve', checklist: NONE_TICKED }, // boxes unticked
			{ decision: 'reject', message: '' }, // reason missing
			{ decision: 'approve', expectedStatus: 'waiting_on_installer' } // stale page
		];
		for (const attempt of attempts) {
			const result = await decide({ adminId: admin.id, installerId: installer.id, ...attempt });
			expect(result.ok, JSON.stringify(attempt)).toBe(false);
		}
		expect((await profileOf(installer.id))?.vettingStatus).toBe('applied');
		expect((await eventsOf(installer.id)).map((e) => e.action)).toEqual(['submit']);

		// A non-admin cannot decide at all.
		const other = await makeAccount('installer');
		expect(await decide({ adminId: other.id, installerId: installer.id })).toMatchObject({
			ok: false
		});

		// After a rejection nothing more can happen.
		expect(
			(
				await decide({
					adminId: admin.id,
					installerId: installer.id,
					decision: 'reject',
					message: 'ABN cancelled'
				})
			).ok
		).toBe(true);
		const afterReject = await decide({
			adminId: admin.id,
			installerId: installer.id,
			expectedStatus: 'rejected'
		});
		expect(afterReject).toMatchObject({ ok: false, status: 409 });
		expect((await profileOf(installer.id))?.vettingStatus).toBe('rejected');
		expect((await mailsTo(installer.email)).map((m) => m.template)).toEqual([
			'vetting-received',
			'vetting-rejected'
		]);
	});

	it('runs ask-for-more, resubmission, approval, suspension and reinstatement with e-mails', async () => {
		const admin = await makeAccount('admin');
		const installer = await makeApplicant();
		const ids = { adminId: admin.id, installerId: installer.id };
		expect(
			(
				await decide({
					...ids,
					decision: 'request-info',
					message: 'Please add your qualification.'
				})
			).ok
		).toBe(true);
		expect((await profileOf(installer.id))?.vettingStatus).toBe('waiting_on_installer');
		await addDocument(installer.id, 'qualification');
		expect((await submitApplication(installer.id)).ok).toBe(true);
		expect((await decide(ids)).ok).toBe(true);
		expect(
			(
				await decide({
					...ids,
					decision: 'suspend',
					expectedStatus: 'approved',
					message: 'Complaint'
				})
			).ok
		).toBe(true);
		expect((await decide({ ...ids, decision: 'reinstate', expectedStatus: 'suspended' })).ok).toBe(
			true
		);

		const events = await eventsOf(installer.id);
		expect(events.map((e) => `${e.action}:${e.fromStatus}->${e.toStatus}`)).toEqual([
			'submit:null->applied',
			'request-info:applied->waiting_on_installer',
			'submit:waiting_on_installer->applied',
			'approve:applied->approved',
			'suspend:approved->suspended',
			'reinstate:suspended->approved'
		]);
		const approval = events.find((e) => e.action === 'approve');
		expect(approval?.actorId).toBe(admin.id);
		expect(approval?.checklist).toEqual(ALL_TICKED);
		const mails = await mailsTo(installer.email);
		expect(mails.map((m) => m.template)).toEqual([
			'vetting-received',
			'vetting-more-info',
			'vetting-received',
			'vetting-approved',
			'vetting-suspended',
			'vetting-reinstated'
		]);
		expect(mails[1]?.text).toContain('Please add your qualification.');
	});

	it('lets exactly one of two admins deciding at once win', async () => {
		const [first, second] = await Promise.all([makeAccount('admin'), makeAccount('admin')]);
		for (let round = 0; round < 4; round++) {
			const installer = await makeApplicant();
			const results = await Promise.all([
				decide({ adminId: first.id, installerId: installer.id, decision: 'approve' }),
				decide({
					adminId: second.id,
					installerId: installer.id,
					decision: 'reject',
					message: 'No ID'
				})
			]);
			expect(results.filter((r) => r.ok)).toHaveLength(1);
			const loser = results.find((r) => !r.ok);
			expect(loser).toMatchObject({ ok: false, status: 409 });
			expect(!loser?.ok && loser?.message).toMatch(/Another admin changed this application/);

			const decisions = (await eventsOf(installer.id)).filter((e) => e.action !== 'submit');
			expect(decisions).toHaveLength(1);
			expect((await profileOf(installer.id))?.vettingStatus).toBe(decisions[0]?.toStatus);
			const mails = (await mailsTo(installer.email)).map((m) => m.template);
			expect(mails.filter((t) => t !== 'vetting-received')).toHaveLength(1);
		}
	});
});

describe('audit trail', () => {
	it('refuses UPDATE, DELETE and TRUNCATE, even from the app', async () => {
		const installer = await makeApplicant();
		await expect(
			db
				.update(vettingEvent)
				.set({ reason: 'rewritten' })
				.where(eq(vettingEvent.installerId, installer.id))
		).rejects.toThrow();
		await expect(
			db.delete(vettingEvent).where(eq(vettingEvent.installerId, installer.id))
		).rejects.toThrow();
		await expect(db.execute(sql`truncate vetting_event`)).rejects.toThrow();
		const [event] = await db
			.select()
			.from(vettingEvent)
			.where(and(eq(vettingEvent.installerId, installer.id), eq(vettingEvent.action, 'submit')));
		expect(event?.reason).toBeNull();
	});

	it('names the trail in the refusal so an operator knows why', async () => {
		const installer = await makeApplicant();
		let message = '';
		try {
			await db.execute(sql`delete from vetting_event where installer_id = ${installer.id}`);
		} catch (err) {
			const cause = (err as { cause?: { message?: string } }).cause;
			message = cause?.message ?? (err as Error).message;
		}
		expect(message).toMatch(/audit trail/);
	});
});

describe('document access', () => {
	it('serves private documents only to their installer and admins', async () => {
		const installer = await makeApplicant();
		const [other, owner, admin] = await Promise.all([
			makeAccount('installer'),
			makeAccount('owner'),
			makeAccount('admin')
		]);
		const privateId = await addDocument(installer.id, 'insurance');
		const galleryId = await addDocument(installer.id, 'gallery');

		const self = await findViewableDocument({ id: installer.id, role: 'installer' }, privateId);
		expect(typeof self === 'object' && self.id).toBe(privateId);
		const asAdmin = await findViewableDocument({ id: admin.id, role: 'admin' }, privateId);
		expect(typeof asAdmin === 'object' && asAdmin.installerId).toBe(installer.id);
		expect(await findViewableDocument({ id: other.id, role: 'installer' }, privateId)).toBe(
			'forbidden'
		);
		expect(await findViewableDocument({ id: owner.id, role: 'owner' }, privateId)).toBe(
			'forbidden'
		);
		expect(await findViewableDocument(null, privateId)).toBe('sign-in');
		// Unknown ids tell an anonymous prober nothing more than a real one.
		expect(await findViewableDocument(null, crypto.randomUUID())).toBe('sign-in');
		expect(await findViewableDocument({ id: owner.id, role: 'owner' }, crypto.randomUUID())).toBe(
			'not-found'
		);
		// Not approved yet, so the gallery is not public either.
		expect(await findViewableDocument(null, galleryId)).toBe('sign-in');
	});

	it('serves gallery photos to anyone only while the profile is public', async () => {
		const admin = await makeAccount('admin');
		const owner = await makeAccount('owner');
		const installer = await makeApplicant();
		const galleryId = await addDocument(installer.id, 'gallery');
		const kindFor = async (viewer: Parameters<typeof findViewableDocument>[0]) => {
			const doc = await findViewableDocument(viewer, galleryId);
			return typeof doc === 'object' ? doc.kind : doc;
		};

		// Under review: the installer and admins only.
		expect(await kindFor(null)).toBe('sign-in');
		expect(await kindFor({ id: owner.id, role: 'owner' })).toBe('forbidden');
		expect(await kindFor({ id: installer.id, role: 'installer' })).toBe('gallery');
		expect(await kindFor({ id: admin.id, role: 'admin' })).toBe('gallery');

		const decide = (decision: 'approve' | 'suspend', expectedStatus: 'applied' | 'approved') =>
			decideApplication({
				adminId: admin.id,
				installerId: installer.id,
				decision,
				expectedStatus,
				message: decision === 'suspend' ? 'Complaint under review.' : null,
				checklist: ALL_TICKED
			});
		expect((await decide('approve', 'applied')).ok).toBe(true);
		expect(await kindFor(null)).toBe('gallery');
		expect(await kindFor({ id: owner.id, role: 'owner' })).toBe('gallery');

		expect((await decide('suspend', 'approved')).ok).toBe(true);
		expect(await kindFor(null)).toBe('sign-in');
		expect(await kindFor({ id: owner.id, role: 'owner' })).toBe('forbidden');
		expect(await kindFor({ id: admin.id, role: 'admin' })).toBe('gallery');
	});
});

describe('public profile and queue', () => {
	it('shows vetted installers without base point, address or private documents', async () => {
		const admin = await makeAccount('admin');
		const installer = await makeApplicant();
		expect(await getPublicProfile(installer.id, null)).toBeNull(); // not approved yet
		const preview = await getPublicProfile(installer.id, { id: installer.id, role: 'installer' });
		expect(preview?.vetted).toBe(false);

		await decideApplication({
			adminId: admin.id,
			installerId: installer.id,
			decision: 'approve',
			expectedStatus: 'applied',
			message: null,
			checklist: ALL_TICKED
		});
		await addDocument(installer.id, 'gallery');
		const shown = await getPublicProfile(installer.id, null);
		expect(shown?.vetted).toBe(true);
		expect(shown?.suburb).toBe('Norwood');
		expect(shown?.gallery).toHaveLength(1);
		const text = JSON.stringify(shown);
		for (const secret of [
			'latitude',
			'longitude',
			'workshopAddress',
			'abn',
			'phone',
			'insurance'
		]) {
			expect(text).not.toContain(secret);
		}
		expect(text).not.toContain(String(NORWOOD.latitude));
	});

	it('filters the queue by standing and pages through it', async () => {
		const created = [];
		for (let i = 0; i < 3; i++) created.push(await makeApplicant());
		const drafts = await makeCompleteDraft();
		const applied = await listVettingQueue({ status: 'applied', sort: 'newest', page: 1 });
		const ids = applied.rows.map((r) => r.id);
		for (const c of created) expect(ids).toContain(c.id);
		expect(ids).not.toContain(drafts.id); // never sent: not in the queue
		expect(applied.rows.every((r) => r.status === 'applied')).toBe(true);
		const times = applied.rows.map((r) => r.submittedAt?.getTime() ?? 0);
		expect(times).toEqual([...times].sort((a, b) => b - a));
		const none = await listVettingQueue({ status: 'suspended', sort: 'oldest', page: 1 });
		expect(none.rows.every((r) => r.status === 'suspended')).toBe(true);
		const beyond = await listVettingQueue({ status: 'applied', sort: 'oldest', page: 999 });
		expect(beyond.rows).toHaveLength(0);
		expect(beyond.total).toBe(applied.total);
	});
});

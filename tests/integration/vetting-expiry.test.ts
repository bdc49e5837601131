import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '$lib/server/db';
import {
	emailOutbox,
	installerProfile,
	insuranceReminder,
	vettingEvent
} from '$lib/server/db/schema';
import { decideApplication, runInsuranceExpiryCheck } from '$lib/server/people/vetting';
import { saveInsuranceDetails } from '$lib/server/people/installers';
import { localToUtc } from '$lib/time';
import { canQuote, localDate } from '$lib/people/vetting';
import { ALL_TICKED, makeAccount, makeApplicant } from './vetting-helpers';

const ZONE = 'Australia/Adelaide';
const addDays = (day: string, days: number) =>
	new Date(Date.parse(`${day}T00:00:00Z`) + days * 86_400_000).toISOString().slice(0, 10);
/** 06:00 Adelaide time on a local date: when the scheduled job runs. */
const sixAm = (day: string) => localToUtc(day, '06:00', ZONE);

async function approvedInstaller(expiresOn: string) {
	const admin = await makeAccount('admin');
	const installer = await makeApplicant(expiresOn);
	const approved = await decideApplication({
		adminId: admin.id,
		installerId: installer.id,
		decision: 'approve',
		expectedStatus: 'applied',
		message: null,
		checklist: ALL_TICKED
	});
	if (!approved.ok) throw new Error(approved.message);
	return { admin, installer };
}

const templatesTo = async (to: string) =>
	(
		await db
			.select({ template: emailOutbox.template, subject: emailOutbox.subject })
			.from(emailOutbox)
			.where(eq(emailOutbox.toAddress, to))
	).filter((m) => m.template.startsWith('insurance-'));

async function profileOf(id: string) {
	const [row] = await db.select().from(installerProfile).where(eq(installerProfile.userId, id));
	if (!row) throw new Error('no profile');
	return row;
}

describe('insurance expiry job', () => {
	it('reminds 30 and 7 days ahead once each, then pauses quoting on the expiry date', async () => {
		const today = localDate(new Date(), ZONE);
		const expiresOn = addDays(today, 30);
		const { admin, installer } = await approvedInstaller(expiresOn);

		await runInsuranceExpiryCheck(sixAm(today));
		await runInsuranceExpiryCheck(sixAm(today)); // a retry the same morning
		await runInsuranceExpiryCheck(sixAm(addDays(today, 1)));
		expect((await templatesTo(installer.email)).map((m) => m.subject)).toEqual([
			'Your insurance expires in 30 days'
		]);

		await runInsuranceExpiryCheck(sixAm(addDays(today, 23)));
		await runInsuranceExpiryCheck(sixAm(addDays(today, 23)));
		await runInsuranceExpiryCheck(sixAm(addDays(today, 29)));
		expect((await templatesTo(installer.email)).map((m) => m.subject)).toEqual([
			'Your insurance expires in 30 days',
			'Your insurance expires in 7 days'
		]);
		const reminders = await db
			.select({ daysBefore: insuranceReminder.daysBefore, expiresOn: insuranceReminder.expiresOn })
			.from(insuranceReminder)
			.where(eq(insuranceReminder.installerId, installer.id));
		expect(reminders.map((r) => r.daysBefore).sort()).toEqual([30, 7]);
		expect(reminders.every((r) => r.expiresOn === expiresOn)).toBe(true);
		expect(canQuote(await profileOf(installer.id))).toBe(true);

		// The job sees the expiry date arrive: quoting pauses, once.
		await runInsuranceExpiryCheck(sixAm(expiresOn));
		await runInsuranceExpiryCheck(sixAm(addDays(expiresOn, 1)));
		const paused = await profileOf(installer.id);
		expect(paused.vettingStatus).toBe('approved');
		expect(paused.pausedReason).toContain(expiresOn);
		expect(canQuote(paused)).toBe(false);
		expect((await templatesTo(installer.email)).map((m) => m.template)).toEqual([
			'insurance-reminder',
			'insurance-reminder',
			'insurance-paused'
		]);
		const pauses = (
			await db.select().from(vettingEvent).where(eq(vettingEvent.installerId, installer.id))
		).filter((e) => e.action === 'pause');
		expect(pauses).toHaveLength(1);
		expect(pauses[0]?.actorId).toBeNull();

		// A new certificate lifts the pause only once an admin approves it.
		const renewed = addDays(today, 400);
		const saved = await saveInsuranceDetails(installer.id, {
			insurer: 'Gumleaf Mutual',
			policyNumber: 'PL-999999',
			coverCents: 20_000_000_00,
			expiresOn: renewed
		});
		expect(saved.ok).toBe(true);
		expect(canQuote(await profileOf(installer.id))).toBe(false);
		const approved = await decideApplication({
			adminId: admin.id,
			installerId: installer.id,
			decision: 'approve-insurance',
			expectedStatus: 'approved',
			message: null,
			checklist: ALL_TICKED
		});
		expect(approved.ok).toBe(true);
		expect(canQuote(await profileOf(installer.id))).toBe(true);
		expect((await templatesTo(installer.email)).at(-1)?.template).toBe('insurance-approved');
	});

	it('refuses to lift a pause while the certificate on file is still lapsed', async () => {
		const today = localDate(new Date(), ZONE);
		const { admin, installer } = await approvedInstaller(addDays(today, 3));
		await runInsuranceExpiryCheck(sixAm(addDays(today, 3)));
		expect((await profileOf(installer.id)).pausedReason).not.toBeNull();
		// The admin's own check uses today's real date, when the certificate is still current; move
		// the expiry into the past the way a lapsed renewal would look.
		await db
			.update(installerProfile)
			.set({ insuranceExpiresOn: addDays(today, -1) })
			.where(eq(installerProfile.userId, installer.id));
		const result = await decideApplication({
			adminId: admin.id,
			installerId: installer.id,
			decision: 'approve-insurance',
			expectedStatus: 'approved',
			message: null,
			checklist: ALL_TICKED
		});
		expect(result).toMatchObject({ ok: false, status: 400 });
		expect((await profileOf(installer.id)).pausedReason).not.toBeNull();
	});

	it('pauses a vetted installer who types in new insurance details until an admin checks them', async () => {
		const { installer } = await approvedInstaller('2030-01-31');
		const result = await saveInsuranceDetails(installer.id, {
			insurer: 'Saltbush Underwriting',
			policyNumber: 'PL-222',
			coverCents: 20_000_000_00,
			expiresOn: '2031-01-31'
		});
		expect(result).toMatchObject({ ok: true, paused: true });
		expect(canQuote(await profileOf(installer.id))).toBe(false);
	});
});

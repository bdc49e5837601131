// Issue 12, account settings: name, e-mail change confirmed by link, password, sessions, and
// closing the account, against PostgreSQL, with each refusal changing nothing.
import { randomBytes } from 'node:crypto';
import { and, eq, isNull } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { authenticate, createAccount } from '$lib/server/people/accounts';
import {
	changeDisplayName,
	changePassword,
	confirmEmailChange,
	EMAIL_NOW_TAKEN,
	endAllOtherSessions,
	endOtherSession,
	getAccountSettings,
	requestEmailChange,
	WRONG_CURRENT_PASSWORD
} from '$lib/server/people/account-settings';
import {
	closeAccount,
	CLOSED_ACCOUNT_NAME,
	CLOSED_INSTALLER_PAUSE,
	LAST_ADMIN,
	previewAccountClosing
} from '$lib/server/people/account-closing';
import { sessionHandle } from '$lib/server/auth';
import { bookQuote } from '$lib/server/marketplace/bookings';
import { db } from '$lib/server/db';
import {
	emailOutbox,
	emailToken,
	installerProfile,
	job,
	quote,
	session,
	user,
	vettingEvent,
	type Role
} from '$lib/server/db/schema';
import { suspendAccount } from '$lib/server/people/admin-users';
import { getPublicProfile } from '$lib/server/people/installers';
import { createDraftJob } from '$lib/server/marketplace/jobs';
import { hashPassword } from '$lib/server/people/password';
import { ACCOUNT_PASSWORD_CHECKS } from '$lib/server/rate-limit';
import { submitQuote } from '$lib/server/marketplace/quotes';
import { ADELAIDE, goodQuote, makeInstaller, makeOpenJob, pricedParts } from './matching-helpers';

process.env.ORIGIN = 'http://tapline.test';
const PASSWORD = 'old enough passphrase';
let n = 0;
const freshEmail = (label = 'person') => `${label}${++n}.${Date.now()}@example.test`;

let passwordHash: Promise<string> | undefined;
/** An account with a real password, of any role, confirmed. */
async function makePerson(role: Role, id: string = crypto.randomUUID()) {
	passwordHash ??= hashPassword(PASSWORD);
	const email = freshEmail(role);
	await db.insert(user).values({
		id,
		email,
		passwordHash: await passwordHash,
		role,
		displayName: `Sam ${n}`,
		emailVerifiedAt: new Date()
	});
	return { id, email };
}

/** A session row as Lucia writes it (40 lower-case base32 characters). */
async function addSession(userId: string) {
	const id = randomBytes(25).toString('hex').slice(0, 40);
	await db
		.insert(session)
		.values({ id, userId, expiresAt: new Date(Date.now() + 30 * 86_400_000) });
	return id;
}

const sessionsOf = async (userId: string) =>
	(await db.select({ id: session.id }).from(session).where(eq(session.userId, userId)))
		.map((s) => s.id)
		.sort();

const mailTo = (to: string) =>
	db
		.select({ template: emailOutbox.template, text: emailOutbox.text })
		.from(emailOutbox)
		.where(eq(emailOutbox.toAddress, to))
		.orderBy(emailOutbox.createdAt);

const userRow = async (id: string) => (await db.select().from(user).where(eq(user.id, id)))[0]!;

describe('display name', () => {
	it('changes the name, trimmed', async () => {
		const me = await makePerson('owner');
		expect(await changeDisplayName(me.id, '  Robin Vale ')).toEqual({ ok: true });
		expect((await userRow(me.id)).displayName).toBe('Robin Vale');
	});
});

describe('e-mail change', () => {
	it('keeps the old address until the link is used, tells the old address, then moves', async () => {
		const me = await makePerson('owner');
		const next = freshEmail('new');
		const asked = await requestEmailChange(me.id, {
			newEmail: ` ${next.toUpperCase()} `,
			passwordForEmail: PASSWORD
		});
		expect(asked).toEqual({ ok: true, sentTo: next });
		expect((await userRow(me.id)).email).toBe(me.email);
		const [link] = await mailTo(next);
		expect(link?.template).toBe('email-change-confirm');
		expect((await mailTo(me.email)).map((m) => m.template)).toEqual(['email-change-requested']);
		const current = await addSession(me.id);
		const settings = await getAccountSettings(me.id, current);
		expect(settings?.pendingEmail?.to).toBe(next);

		const token = link!.text.match(/token=([A-Za-z0-9_-]+)/)![1]!;
		expect(await confirmEmailChange(token)).toEqual({ ok: true, userId: me.id });
		const after = await userRow(me.id);
		expect(after.email).toBe(next);
		expect(after.emailVerifiedAt).not.toBeNull();
		expect((await mailTo(me.email)).map((m) => m.template)).toEqual([
			'email-change-requested',
			'email-changed'
		]);
		// Used once only.
		expect(await confirmEmailChange(token)).toMatchObject({ ok: false, status: 400 });
		expect((await getAccountSettings(me.id, current))?.pendingEmail).toBeNull();
	});

	it('refuses a wrong current password or the same address, writing nothing', async () => {
		const me = await makePerson('installer');
		const next = freshEmail('new');
		expect(
			await requestEmailChange(me.id, { newEmail: next, passwordForEmail: 'not my password' })
		).toMatchObject({
			ok: false,
			status: 400,
			message: WRONG_CURRENT_PASSWORD,
			fields: { passwordForEmail: WRONG_CURRENT_PASSWORD }
		});
		expect(
			await requestEmailChange(me.id, { newEmail: me.email, passwordForEmail: PASSWORD })
		).toMatchObject({
			ok: false,
			status: 400,
			fields: { newEmail: 'That is already your address.' }
		});
		expect(await db.select().from(emailToken).where(eq(emailToken.userId, me.id))).toEqual([]);
		expect(await mailTo(next)).toEqual([]);
		expect(await mailTo(me.email)).toEqual([]);
	});

	it('answers a taken address as any other, mails its holder a notice without a link', async () => {
		const me = await makePerson('owner');
		const other = await makePerson('owner');
		const asked = await requestEmailChange(me.id, {
			newEmail: other.email,
			passwordForEmail: PASSWORD
		});
		// Same answer as for a free address: the form cannot tell who has an account.
		expect(asked).toEqual({ ok: true, sentTo: other.email });
		const mails = await mailTo(other.email);
		expect(mails.map((m) => m.template)).toEqual(['email-change-existing']);
		expect(mails[0]!.text).not.toMatch(/token=/);
		expect((await userRow(me.id)).email).toBe(me.email);
	});

	it('refuses the link with 409 when the address was taken meanwhile, changing nothing', async () => {
		const me = await makePerson('owner');
		const next = freshEmail('raced');
		expect(
			(await requestEmailChange(me.id, { newEmail: next, passwordForEmail: PASSWORD })).ok
		).toBe(true);
		const token = (await mailTo(next))[0]!.text.match(/token=([A-Za-z0-9_-]+)/)![1]!;
		const someoneElse = await createAccount({
			email: next,
			password: 'another long passphrase',
			displayName: 'Quick',
			role: 'owner'
		});
		expect(someoneElse.user).not.toBeNull();
		expect(await confirmEmailChange(token)).toEqual({
			ok: false,
			status: 409,
			message: EMAIL_NOW_TAKEN
		});
		expect((await userRow(me.id)).email).toBe(me.email);
	});

	it('limits current-password checks per account, before the password is checked', async () => {
		const me = await makePerson('owner');
		for (let i = 0; i < ACCOUNT_PASSWORD_CHECKS; i++) {
			expect(
				await requestEmailChange(me.id, { newEmail: freshEmail(), passwordForEmail: 'wrong one' })
			).toMatchObject({ status: 400 });
		}
		const refused = await requestEmailChange(me.id, {
			newEmail: freshEmail(),
			passwordForEmail: PASSWORD
		});
		expect(refused).toMatchObject({ ok: false, status: 429 });
		expect(await db.select().from(emailToken).where(eq(emailToken.userId, me.id))).toEqual([]);
	});
});

describe('password change', () => {
	it('needs the current password, keeps this session and ends the others', async () => {
		const me = await makePerson('owner');
		const here = await addSession(me.id);
		const phone = await addSession(me.id);
		const laptop = await addSession(me.id);

		const wrong = await changePassword(me.id, here, {
			currentPassword: 'a wrong password',
			newPassword: 'brand new passphrase'
		});
		expect(wrong).toMatchObject({
			ok: false,
			status: 400,
			fields: { currentPassword: WRONG_CURRENT_PASSWORD }
		});
		expect(await sessionsOf(me.id)).toEqual([here, phone, laptop].sort());
		expect(await authenticate(me.email, PASSWORD)).not.toBeNull();

		const done = await changePassword(me.id, here, {
			currentPassword: PASSWORD,
			newPassword: 'brand new passphrase'
		});
		expect(done).toEqual({ ok: true, endedSessions: 2 });
		expect(await sessionsOf(me.id)).toEqual([here]);
		expect(await authenticate(me.email, PASSWORD)).toBeNull();
		expect(await authenticate(me.email, 'brand new passphrase')).not.toBeNull();
		expect((await userRow(me.id)).passwordHash).toMatch(/^\$argon2id\$/);
		expect((await mailTo(me.email)).map((m) => m.template)).toEqual(['password-changed']);
	});

	it('refuses the current password as the new one', async () => {
		const me = await makePerson('admin');
		const here = await addSession(me.id);
		expect(
			await changePassword(me.id, here, { currentPassword: PASSWORD, newPassword: PASSWORD })
		).toMatchObject({ ok: false, status: 400 });
		expect(await mailTo(me.email)).toEqual([]);
	});
});

describe('sessions', () => {
	it('lists the sessions by handle, marks this one, and ends only another of the same account', async () => {
		const me = await makePerson('installer');
		const stranger = await makePerson('installer');
		const here = await addSession(me.id);
		const other = await addSession(me.id);
		const strangers = await addSession(stranger.id);

		const listed = (await getAccountSettings(me.id, here))!.sessions;
		expect(listed).toHaveLength(2);
		expect(listed.filter((s) => s.current).map((s) => s.handle)).toEqual([sessionHandle(here)]);
		// The cookie value never leaves the server.
		expect(JSON.stringify(listed)).not.toContain(here);
		expect(listed.every((s) => s.createdAt instanceof Date)).toBe(true);

		expect(await endOtherSession(me.id, sessionHandle(here), here)).toMatchObject({ status: 400 });
		expect(await endOtherSession(me.id, sessionHandle(strangers), here)).toMatchObject({
			status: 409
		});
		expect(await sessionsOf(stranger.id)).toEqual([strangers]);
		expect(await endOtherSession(me.id, sessionHandle(other), here)).toEqual({ ok: true });
		expect(await sessionsOf(me.id)).toEqual([here]);
	});

	it('ends every other session at once', async () => {
		const me = await makePerson('owner');
		const here = await addSession(me.id);
		await addSession(me.id);
		await addSession(me.id);
		expect(await endAllOtherSessions(me.id, here)).toBe(2);
		expect(await sessionsOf(me.id)).toEqual([here]);
	});
});

describe('closing an account', () => {
	const close = (id: string, currentPassword = PASSWORD, confirmed = true) =>
		closeAccount(id, { passwordToClose: currentPassword, confirmed });

	it('withdraws an owner’s open jobs, removes drafts, anonymises and signs out everywhere', async () => {
		const me = await makePerson('owner');
		const { job: open } = await makeOpenJob(ADELAIDE, { ownerId: me.id });
		const draftId = await createDraftJob(me.id);
		await addSession(me.id);
		await addSession(me.id);
		expect(await previewAccountClosing(me.id, 'owner')).toMatchObject({
			openJobs: 1,
			drafts: 1,
			activeBookings: []
		});

		expect(await close(me.id)).toEqual({ ok: true });
		const [openAfter] = await db.select().from(job).where(eq(job.id, open.id));
		expect(openAfter).toMatchObject({ status: 'withdrawn', addressLine: null });
		expect(await db.select().from(job).where(eq(job.id, draftId))).toEqual([]);
		const after = await userRow(me.id);
		expect(after).toMatchObject({ displayName: CLOSED_ACCOUNT_NAME, emailVerifiedAt: null });
		expect(after.email).not.toBe(me.email);
		expect(after.deletedAt).not.toBeNull();
		expect(await sessionsOf(me.id)).toEqual([]);
		expect(await authenticate(me.email, PASSWORD)).toBeNull();
		expect((await mailTo(me.email)).map((m) => m.template)).toEqual(['account-closed']);
		// A closed account cannot be closed or changed again, by its holder or by an admin.
		expect(await changeDisplayName(me.id, 'Back again')).toMatchObject({ status: 404 });
		const admin = await makePerson('admin');
		expect(await suspendAccount(admin.id, me.id, 'Spam')).toMatchObject({ ok: false, status: 409 });
		expect((await userRow(me.id)).suspendedAt).toBeNull();
	});

	it('refuses without the tick or with a wrong password, changing nothing', async () => {
		const me = await makePerson('owner');
		const { job: open } = await makeOpenJob(ADELAIDE, { ownerId: me.id });
		const here = await addSession(me.id);
		expect(await close(me.id, PASSWORD, false)).toMatchObject({ ok: false, status: 400 });
		expect(await close(me.id, 'wrong password here')).toMatchObject({
			ok: false,
			status: 400,
			message: WRONG_CURRENT_PASSWORD
		});
		expect((await userRow(me.id)).deletedAt).toBeNull();
		expect(await sessionsOf(me.id)).toEqual([here]);
		const [still] = await db.select({ status: job.status }).from(job).where(eq(job.id, open.id));
		expect(still?.status).toBe('collecting_quotes');
	});

	async function bookedJob() {
		const owner = await makePerson('owner');
		const { job: j } = await makeOpenJob(ADELAIDE, { ownerId: owner.id });
		const installer = await makeInstaller({ base: ADELAIDE });
		expect((await submitQuote(installer.id, j.id, goodQuote(pricedParts(j)))).ok).toBe(true);
		const [q] = await db.select().from(quote).where(eq(quote.jobId, j.id));
		expect((await bookQuote(owner.id, j.id, q!.id, q!.slots[0]!.start)).ok).toBe(true);
		return { owner, installer, jobId: j.id };
	}

	it('refuses an owner or installer with a booking in progress, changing nothing', async () => {
		const { owner, installer, jobId } = await bookedJob();
		const ownerHere = await addSession(owner.id);
		const refused = await close(owner.id);
		expect(refused).toMatchObject({ ok: false, status: 409 });
		expect((refused as { message: string }).message).toMatch(/booking in progress/);
		expect((await userRow(owner.id)).deletedAt).toBeNull();
		expect(await sessionsOf(owner.id)).toEqual([ownerHere]);
		const [j] = await db.select({ status: job.status }).from(job).where(eq(job.id, jobId));
		expect(j?.status).toBe('booked');
		expect((await previewAccountClosing(owner.id, 'owner')).activeBookings).toHaveLength(1);

		// The installer's password is not known to makeInstaller: give it one.
		await db
			.update(user)
			.set({ passwordHash: await hashPassword(PASSWORD) })
			.where(eq(user.id, installer.id));
		expect(await close(installer.id)).toMatchObject({ ok: false, status: 409 });
		expect((await userRow(installer.id)).deletedAt).toBeNull();
		expect(
			await db.select().from(vettingEvent).where(eq(vettingEvent.installerId, installer.id))
		).toEqual([]);
	});

	it('withdraws an installer’s live quotes, tells the owner, pauses for good and keeps the vetting record', async () => {
		const installer = await makeInstaller({ base: ADELAIDE });
		await db
			.update(user)
			.set({ passwordHash: await hashPassword(PASSWORD) })
			.where(eq(user.id, installer.id));
		const { job: j, ownerId } = await makeOpenJob(ADELAIDE);
		expect((await submitQuote(installer.id, j.id, goodQuote(pricedParts(j)))).ok).toBe(true);
		const [owner] = await db.select({ email: user.email }).from(user).where(eq(user.id, ownerId));

		expect(await close(installer.id)).toEqual({ ok: true });
		const [q] = await db.select({ status: quote.status }).from(quote).where(eq(quote.jobId, j.id));
		expect(q?.status).toBe('withdrawn');
		expect((await mailTo(owner!.email)).map((m) => m.template)).toContain(
			'quote-withdrawn-suspended'
		);
		const [profile] = await db
			.select()
			.from(installerProfile)
			.where(eq(installerProfile.userId, installer.id));
		expect(profile).toMatchObject({
			pausedReason: CLOSED_INSTALLER_PAUSE,
			phone: null,
			contactName: null
		});
		const events = await db
			.select({ action: vettingEvent.action })
			.from(vettingEvent)
			.where(eq(vettingEvent.installerId, installer.id));
		expect(events.map((e) => e.action)).toContain('account-closed');
		expect(await getPublicProfile(installer.id, null)).toBeNull();
	});

	it('refuses the last admin, and lets an admin go while another remains', async () => {
		// Admins made by earlier tests of this file are set aside, so `first` is the only one.
		await db.update(user).set({ deletedAt: new Date() }).where(eq(user.role, 'admin'));
		const first = await makePerson('admin');
		const remaining = await db
			.select({ id: user.id })
			.from(user)
			.where(and(eq(user.role, 'admin'), isNull(user.deletedAt)));
		expect(remaining).toEqual([{ id: first.id }]);
		expect(await close(first.id)).toEqual({ ok: false, status: 409, message: LAST_ADMIN });
		expect((await userRow(first.id)).deletedAt).toBeNull();

		const second = await makePerson('admin');
		expect(await close(first.id)).toEqual({ ok: true });
		expect(await close(second.id)).toEqual({ ok: false, status: 409, message: LAST_ADMIN });
	});
});

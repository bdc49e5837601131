import { and, eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { authenticate, resetPassword, signIn } from '$lib/server/people/accounts';
import {
	forcePasswordReset,
	reinstateAccount,
	searchUsers,
	suspendAccount
} from '$lib/server/people/admin-users';
import { db } from '$lib/server/db';
import { adminAudit, emailOutbox, quote, session, user } from '$lib/server/db/schema';
import { hashPassword } from '$lib/server/people/password';
import { submitQuote } from '$lib/server/marketplace/quotes';
import {
	ADELAIDE,
	goodQuote,
	makeInstaller,
	makeOpenJob,
	makeUser,
	pricedParts
} from './matching-helpers';

const PASSWORD = 'a long enough password';

/** An account of a role with a known password and one open session. */
async function account(role: 'owner' | 'installer' | 'admin', label: string = role) {
	const made =
		role === 'installer'
			? await makeInstaller()
			: await makeUser(role === 'admin' ? 'owner' : role, label);
	await db
		.update(user)
		.set({ role, passwordHash: await hashPassword(PASSWORD) })
		.where(eq(user.id, made.id));
	await db.insert(session).values({
		id: `s${crypto.randomUUID().replaceAll('-', '')}`,
		userId: made.id,
		expiresAt: new Date(Date.now() + 86_400_000)
	});
	return made;
}

const sessionsOf = (id: string) => db.select().from(session).where(eq(session.userId, id));
const mailsTo = (to: string, template: string) =>
	db
		.select()
		.from(emailOutbox)
		.where(and(eq(emailOutbox.toAddress, to), eq(emailOutbox.template, template)));

describe('admins looking after accounts', () => {
	it('finds accounts by part of a name or e-mail, role and standing, paged in SQL', async () => {
		const marker = `zq${crypto.randomUUID().slice(0, 6)}`;
		const a = await makeUser('owner', `${marker}a`);
		await makeUser('owner', `${marker}b`);
		const c = await account('installer');
		await db
			.update(user)
			.set({ displayName: `${marker.toUpperCase()} Fitting` })
			.where(eq(user.id, c.id));
		const all = await searchUsers({ q: marker, role: '', standing: '', page: 1 });
		expect(all.total).toBe(3);
		const owners = await searchUsers({ q: marker, role: 'owner', standing: '', page: 1 });
		expect(owners.rows.map((r) => r.role)).toEqual(['owner', 'owner']);
		// '%' is a character to find, not a wildcard.
		expect((await searchUsers({ q: '%', role: '', standing: '', page: 1 })).total).toBe(0);
		const admin = await account('admin');
		expect((await suspendAccount(admin.id, a.id, 'Testing the filter')).ok).toBe(true);
		const suspended = await searchUsers({ q: marker, role: '', standing: 'suspended', page: 1 });
		expect(suspended.rows.map((r) => r.id)).toEqual([a.id]);
		expect((await searchUsers({ q: marker, role: '', standing: '', page: 2 })).rows).toEqual([]);
	});

	it('suspending an installer signs them out, stops sign-in, withdraws quotes and tells everyone', async () => {
		const admin = await account('admin');
		const installer = await account('installer');
		const { job: j, ownerId } = await makeOpenJob(ADELAIDE);
		const sent = await submitQuote(installer.id, j.id, goodQuote(pricedParts(j)));
		expect(sent.ok).toBe(true);
		const result = await suspendAccount(admin.id, installer.id, 'Unfinished fits reported twice');
		expect(result).toEqual({ ok: true });
		expect(await sessionsOf(installer.id)).toHaveLength(0);
		const [q] = await db.select().from(quote).where(eq(quote.jobId, j.id));
		expect(q?.status).toBe('withdrawn');
		const [owner] = await db.select().from(user).where(eq(user.id, ownerId));
		expect(await mailsTo(owner!.email, 'quote-withdrawn-suspended')).toHaveLength(1);
		const [told] = await mailsTo(installer.email, 'account-suspended');
		expect(told?.text).toContain('Unfinished fits reported twice');
		const refused = await signIn(installer.email, PASSWORD, '203.0.113.9');
		expect(refused).toMatchObject({ ok: false, status: 403 });
		const [entry] = await db
			.select()
			.from(adminAudit)
			.where(eq(adminAudit.targetUserId, installer.id));
		expect(entry).toMatchObject({
			actorId: admin.id,
			action: 'suspend',
			before: { suspended: false, reason: null },
			after: { suspended: true, reason: 'Unfinished fits reported twice' }
		});

		expect((await reinstateAccount(admin.id, installer.id, 'Talked it through')).ok).toBe(true);
		expect(await signIn(installer.email, PASSWORD, '203.0.113.9')).toMatchObject({ ok: true });
		const [again] = await db.select().from(quote).where(eq(quote.jobId, j.id));
		expect(again?.status).toBe('withdrawn');
	});

	it('refuses their own account, a missing one, a second suspension and the last admin', async () => {
		const admin = await account('admin');
		const owner = await account('owner');
		expect(await suspendAccount(admin.id, admin.id, 'Testing myself')).toMatchObject({
			status: 409
		});
		expect(await forcePasswordReset(admin.id, admin.id, 'Testing myself')).toMatchObject({
			status: 409
		});
		expect(await suspendAccount(admin.id, crypto.randomUUID(), 'Nobody')).toMatchObject({
			status: 404
		});
		expect(await reinstateAccount(admin.id, owner.id, 'Not suspended')).toMatchObject({
			status: 409
		});
		expect((await suspendAccount(admin.id, owner.id, 'First time')).ok).toBe(true);
		expect(await suspendAccount(admin.id, owner.id, 'Second time')).toMatchObject({ status: 409 });
		// With every other admin suspended, the one left cannot be suspended.
		const other = await account('admin');
		await db
			.update(user)
			.set({ suspendedAt: new Date(), suspendedReason: 'set aside for the test' })
			.where(and(eq(user.role, 'admin')));
		await db.update(user).set({ suspendedAt: null }).where(eq(user.id, other.id));
		const last = await suspendAccount(admin.id, other.id, 'Leaving nobody');
		expect(last).toMatchObject({
			status: 409,
			message: expect.stringContaining('last active admin')
		});
		const [still] = await db.select().from(user).where(eq(user.id, other.id));
		expect(still?.suspendedAt).toBeNull();
	});

	it('forcing a new password ends sessions, kills the old password and mails a working link', async () => {
		const admin = await account('admin');
		const owner = await account('owner');
		expect(
			(await forcePasswordReset(admin.id, owner.id, 'Password seen in a shared note')).ok
		).toBe(true);
		expect(await sessionsOf(owner.id)).toHaveLength(0);
		expect(await authenticate(owner.email, PASSWORD)).toBeNull();
		const [mail] = await mailsTo(owner.email, 'password-reset-by-admin');
		const token = /token=([\w-]+)/.exec(mail?.text ?? '')?.[1];
		expect(token).toBeTruthy();
		expect(await resetPassword(token!, 'a brand new password')).toBe(true);
		expect(await authenticate(owner.email, 'a brand new password')).not.toBeNull();
	});

	it('keeps the audit trail read-only, even for the app', async () => {
		const admin = await account('admin');
		const owner = await account('owner');
		await suspendAccount(admin.id, owner.id, 'For the trail');
		await expect(db.update(adminAudit).set({ reason: 'rewritten' })).rejects.toThrow();
		await expect(db.delete(adminAudit)).rejects.toThrow();
		const rows = await db.select().from(adminAudit).where(eq(adminAudit.targetUserId, owner.id));
		expect(rows.map((r) => r.reason)).toEqual(['For the trail']);
	});
});

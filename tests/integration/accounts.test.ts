import { and, count, eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import {
	authenticate,
	createAccount,
	createAdminAccount,
	requestPasswordReset,
	resetPassword,
	verifyEmailToken
} from '$lib/server/people/accounts';
import { db } from '$lib/server/db';
import { adminAudit, emailOutbox, emailToken, session, user } from '$lib/server/db/schema';

const ORIGIN = 'http://tapline.test';
// Links in e-mails come from the configured origin (appUrl), whoever causes them.
process.env.ORIGIN = ORIGIN;
const password = 'correct horse battery';
let n = 0;
const freshEmail = () => `person${++n}.${Date.now()}@example.test`;

/** Pulls the one-time token out of the newest outbox message to this address. */
async function tokenFromOutbox(to: string) {
	const rows = await db
		.select({ text: emailOutbox.text })
		.from(emailOutbox)
		.where(eq(emailOutbox.toAddress, to))
		.orderBy(emailOutbox.createdAt);
	const last = rows.at(-1)?.text ?? '';
	const match = last.match(/token=([A-Za-z0-9_-]+)/);
	if (!match?.[1]) throw new Error(`no token in mail to ${to}`);
	return match[1];
}

describe('createAccount', () => {
	it('stores a lower-cased address, an argon2id hash and queues a verification e-mail', async () => {
		const email = freshEmail();
		const result = await createAccount({
			email: `  ${email.toUpperCase()} `,
			password,
			displayName: ' Wren ',
			role: 'owner'
		});
		if (!result.user) throw new Error('no account made');
		const [row] = await db.select().from(user).where(eq(user.id, result.user.id));
		expect(row?.email).toBe(email);
		expect(row?.displayName).toBe('Wren');
		expect(row?.passwordHash).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);
		expect(row?.emailVerifiedAt).toBeNull();
		const mails = await db.select().from(emailOutbox).where(eq(emailOutbox.toAddress, email));
		expect(mails).toHaveLength(1);
		expect(mails[0]?.template).toBe('verify-email');
		expect(mails[0]?.text).toContain(`${ORIGIN}/verify-email?token=`);
		expect(mails[0]?.html).toContain('<a href="http://tapline.test/verify-email?token=');
	});

	it('answers a taken address like a free one and explains by e-mail (issue 11, item 13)', async () => {
		const email = freshEmail();
		await createAccount({ email, password, displayName: 'First', role: 'owner' });
		const again = await createAccount({
			email: email.toUpperCase(),
			password,
			displayName: 'Second',
			role: 'installer'
		});
		// Nothing for the caller to tell apart: no refusal, no account to sign in.
		expect(again).toEqual({ ok: true, user: null });
		const mails = await db
			.select()
			.from(emailOutbox)
			.where(eq(emailOutbox.toAddress, email))
			.orderBy(emailOutbox.createdAt);
		expect(mails.map((m) => m.template)).toEqual(['verify-email', 'sign-up-existing']);
		expect(mails[1]?.text).toContain('already has one');
		expect(mails[1]?.text).toContain(`${ORIGIN}/sign-in`);
		expect(mails[1]?.text).toContain(`${ORIGIN}/forgot-password`);
		const [{ n: users } = { n: 0 }] = await db
			.select({ n: count() })
			.from(user)
			.where(eq(user.email, email));
		expect(users).toBe(1);
		const [first] = await db.select().from(user).where(eq(user.email, email));
		expect(first?.displayName).toBe('First');
	});

	it('sends at most three "you already have an account" e-mails an hour', async () => {
		const email = freshEmail();
		await createAccount({ email, password, displayName: 'First', role: 'owner' });
		for (let i = 0; i < 5; i++) {
			await createAccount({ email, password, displayName: 'Again', role: 'owner' });
		}
		const notices = await db
			.select({ id: emailOutbox.id })
			.from(emailOutbox)
			.where(and(eq(emailOutbox.toAddress, email), eq(emailOutbox.template, 'sign-up-existing')));
		expect(notices).toHaveLength(3);
	});
});

describe('verifyEmailToken', () => {
	it('verifies once and refuses the same token again', async () => {
		const email = freshEmail();
		await createAccount({ email, password, displayName: 'Ver', role: 'installer' });
		const token = await tokenFromOutbox(email);
		expect(await verifyEmailToken(token)).toMatch(/^[0-9a-f-]{36}$/);
		const [row] = await db.select().from(user).where(eq(user.email, email));
		expect(row?.emailVerifiedAt).toBeInstanceOf(Date);
		expect(await verifyEmailToken(token)).toBeNull();
	});

	it('refuses an expired token and an unknown one', async () => {
		const email = freshEmail();
		await createAccount({ email, password, displayName: 'Late', role: 'owner' });
		const token = await tokenFromOutbox(email);
		await db.update(emailToken).set({ expiresAt: new Date(Date.now() - 1000) });
		expect(await verifyEmailToken(token)).toBeNull();
		expect(await verifyEmailToken('not-a-real-token-at-all')).toBeNull();
	});
});

describe('authenticate', () => {
	it('accepts the right password in any letter case of the address, and nothing else', async () => {
		const email = freshEmail();
		await createAccount({ email, password, displayName: 'Auth', role: 'owner' });
		expect((await authenticate(email.toUpperCase(), password))?.email).toBe(email);
		expect(await authenticate(email, 'wrong password here')).toBeNull();
		expect(await authenticate(`nobody.${email}`, password)).toBeNull();
	});
});

describe('password reset', () => {
	it('writes nothing for an unknown address', async () => {
		const [before] = await db.select({ n: count() }).from(emailOutbox);
		expect(await requestPasswordReset('no-such-person@example.test', '192.0.2.1')).toEqual({
			ok: true
		});
		const [after] = await db.select({ n: count() }).from(emailOutbox);
		expect(after?.n).toBe(before?.n);
	});

	it('sets the new password, signs out every session, and works only once', async () => {
		const email = freshEmail();
		const created = await createAccount({ email, password, displayName: 'Reset', role: 'owner' });
		if (!created.user) throw new Error('no account made');
		await db.insert(session).values({
			id: `s-${Date.now()}`,
			userId: created.user.id,
			expiresAt: new Date(Date.now() + 3600_000)
		});
		await requestPasswordReset(email, '192.0.2.2');
		const token = await tokenFromOutbox(email);
		expect(await resetPassword(token, 'a brand new passphrase')).toBe(true);
		expect(await authenticate(email, password)).toBeNull();
		expect(await authenticate(email, 'a brand new passphrase')).not.toBeNull();
		const sessions = await db.select().from(session).where(eq(session.userId, created.user.id));
		expect(sessions).toHaveLength(0);
		expect(await resetPassword(token, 'another passphrase!!')).toBe(false);
	});
});

describe('password reset links and their limits (issue 11, item 7)', () => {
	it('ends every earlier link when a new one is issued, and the others when one is used', async () => {
		const email = freshEmail();
		await createAccount({ email, password, displayName: 'Twice', role: 'owner' });
		await requestPasswordReset(email, '192.0.2.3');
		const older = await tokenFromOutbox(email);
		await requestPasswordReset(email, '192.0.2.3');
		const newer = await tokenFromOutbox(email);
		expect(newer).not.toBe(older);
		expect(await resetPassword(older, 'the older link passphrase')).toBe(false);
		expect(await resetPassword(newer, 'the newer link passphrase')).toBe(true);
		expect(await resetPassword(older, 'the older link passphrase')).toBe(false);
		expect(await authenticate(email, 'the newer link passphrase')).not.toBeNull();
	});

	it('sends at most three links an hour per account, from any addresses', async () => {
		const email = freshEmail();
		await createAccount({ email, password, displayName: 'Many', role: 'owner' });
		const results = await Promise.all(
			Array.from({ length: 30 }, (_, i) => requestPasswordReset(email, `10.2.${i}.1`))
		);
		expect(results.filter((r) => r.ok)).toHaveLength(3);
		expect(results.filter((r) => !r.ok && r.status === 429)).toHaveLength(27);
		const mails = await db
			.select({ id: emailOutbox.id })
			.from(emailOutbox)
			.where(and(eq(emailOutbox.toAddress, email), eq(emailOutbox.template, 'reset-password')));
		expect(mails).toHaveLength(3);
	});

	it('answers an unknown address exactly as a known one, limit included', async () => {
		const known = freshEmail();
		await createAccount({ email: known, password, displayName: 'Known', role: 'owner' });
		const unknown = `nobody.${freshEmail()}`;
		for (const email of [known, unknown]) {
			const answers = [];
			for (let i = 0; i < 4; i++) answers.push(await requestPasswordReset(email, `10.3.${i}.9`));
			expect(answers.map((a) => (a.ok ? 'ok' : a.status))).toEqual(['ok', 'ok', 'ok', 429]);
		}
	});

	it('limits requests per client address across accounts', async () => {
		const address = '198.51.100.77';
		const answers = [];
		for (let i = 0; i < 11; i++) {
			answers.push(await requestPasswordReset(`spray${i}.${freshEmail()}`, address));
		}
		expect(answers.filter((a) => a.ok)).toHaveLength(10);
		expect((await requestPasswordReset(freshEmail(), '198.51.100.78')).ok).toBe(true);
	});
});

describe('createAdminAccount', () => {
	it('lets an admin create an admin with an invitation link, and nobody else', async () => {
		const inviter = {
			id: crypto.randomUUID(),
			email: freshEmail(),
			role: 'admin' as const,
			displayName: 'Boss'
		};
		await db.insert(user).values({ ...inviter, passwordHash: 'unused' });
		const email = freshEmail();
		const created = await createAdminAccount(inviter, { email, displayName: 'New Admin' });
		if (!created.ok) throw new Error(created.message);
		expect(created.user.role).toBe('admin');
		// Audited in the same transaction: who made whom an admin.
		const audit = await db
			.select()
			.from(adminAudit)
			.where(eq(adminAudit.targetUserId, created.user.id));
		expect(audit).toHaveLength(1);
		expect(audit[0]).toMatchObject({ actorId: inviter.id, action: 'admin-invite' });
		const [mail] = await db.select().from(emailOutbox).where(eq(emailOutbox.toAddress, email));
		expect(mail?.template).toBe('admin-invite');
		expect(mail?.text).toContain('Boss created an admin account');
		await expect(
			createAdminAccount(
				{ ...inviter, role: 'owner' },
				{ email: freshEmail(), displayName: 'Nope' }
			)
		).rejects.toThrow(/Only an admin/);
	});
});

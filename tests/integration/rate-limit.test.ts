// Sign-in throttling against PostgreSQL (issue 11, item 2): attempts are taken before the password
// check, so a parallel burst gets its allowance and no more; a stranger's guesses lock their own
// address out of the account, not its holder; the reset link clears the account-wide lock.
import { and, eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import {
	createAccount,
	requestPasswordReset,
	resetPassword,
	signIn
} from '$lib/server/people/accounts';
import { db } from '$lib/server/db';
import { emailOutbox, jobMessage, quote } from '$lib/server/db/schema';
import {
	ACCOUNT_ATTEMPTS,
	ADDRESS_ATTEMPTS,
	MESSAGES_PER_WINDOW,
	PAIR_ATTEMPTS,
	QUOTE_SUBMISSIONS,
	SIGN_UP_NOTICES
} from '$lib/server/rate-limit';
import { submitQuote } from '$lib/server/marketplace/quotes';
import { postJobMessage } from '$lib/server/marketplace/threads';
import { ADELAIDE, goodQuote, makeInstaller, makeOpenJob, pricedParts } from './matching-helpers';

const password = 'correct horse battery';
let n = 0;

async function account() {
	const email = `throttle${++n}.${Date.now()}@example.test`;
	const made = await createAccount({ email, password, displayName: 'Wren', role: 'owner' });
	if (!made.user) throw new Error('no account made');
	return email;
}

/** Statuses of refusals, 'ok' for a sign-in that went through. */
const outcome = (r: Awaited<ReturnType<typeof signIn>>) => (r.ok ? 'ok' : r.status);

describe('sign-in throttling (counters in PostgreSQL)', () => {
	it('checks at most the allowance of a parallel burst, and the right password in it is refused', async () => {
		const email = await account();
		const address = '203.0.113.10';
		const burst = await Promise.all(
			Array.from({ length: 30 }, (_, i) =>
				signIn(email, i === 29 ? password : `wrong guess ${i}`, address)
			)
		);
		const outcomes = burst.map(outcome);
		// Only PAIR_ATTEMPTS attempts reached the password check; the rest were refused before it.
		expect(outcomes.filter((o) => o !== 429)).toHaveLength(PAIR_ATTEMPTS);
		expect(outcomes.filter((o) => o === 429)).toHaveLength(30 - PAIR_ATTEMPTS);
		expect((await signIn(email, password, address)).ok).toBe(false);
	});

	it('keeps a stranger’s lock-out to their own address: the holder still signs in', async () => {
		const email = await account();
		for (let i = 0; i < PAIR_ATTEMPTS; i++) await signIn(email, 'guess', '198.51.100.7');
		expect(outcome(await signIn(email, password, '198.51.100.7'))).toBe(429);
		expect(outcome(await signIn(email.toUpperCase(), password, '192.0.2.44'))).toBe('ok');
	});

	it('locks the account across addresses at the slower limit, and the reset link opens it again', async () => {
		const email = await account();
		for (let i = 0; i < ACCOUNT_ATTEMPTS; i++) {
			expect(outcome(await signIn(email, 'guess', `10.1.${i}.1`))).toBe(400);
		}
		expect(outcome(await signIn(email, password, '192.0.2.45'))).toBe(429);

		await requestPasswordReset(email, '192.0.2.45');
		const [mail] = await db
			.select({ text: emailOutbox.text })
			.from(emailOutbox)
			.where(eq(emailOutbox.toAddress, email))
			.orderBy(emailOutbox.createdAt)
			.then((rows) => rows.slice(-1));
		const token = mail?.text.match(/token=([A-Za-z0-9_-]+)/)?.[1];
		expect(token).toBeDefined();
		expect(await resetPassword(token!, 'a brand new passphrase')).toBe(true);
		expect(outcome(await signIn(email, 'a brand new passphrase', '192.0.2.45'))).toBe('ok');
	});

	it('locks an address that sprays many accounts, not other addresses', async () => {
		const address = `198.51.100.${Date.now() % 250}`;
		for (let i = 0; i < ADDRESS_ATTEMPTS; i++) {
			await signIn(`spray${i}.${Date.now()}@example.test`, 'guess', address);
		}
		expect(outcome(await signIn('someone.else@example.test', 'guess', address))).toBe(429);
		expect(outcome(await signIn('someone.else@example.test', 'guess', '203.0.113.1'))).toBe(400);
	});

	it('starts the pair count again after a right password', async () => {
		const email = await account();
		for (let i = 0; i < PAIR_ATTEMPTS - 1; i++) await signIn(email, 'guess', '192.0.2.7');
		expect(outcome(await signIn(email, password, '192.0.2.7'))).toBe('ok');
		for (let i = 0; i < PAIR_ATTEMPTS - 1; i++) {
			expect(outcome(await signIn(email, 'guess', '192.0.2.7'))).toBe(400);
		}
	});
});

describe('sign-up notices under a parallel burst', () => {
	it('sends at most SIGN_UP_NOTICES "you already have an account" e-mails, however many arrive at once', async () => {
		const email = await account();
		const burst = await Promise.all(
			Array.from({ length: 12 }, () =>
				createAccount({ email, password, displayName: 'Again', role: 'owner' })
			)
		);
		// Every answer is the same as for a free address: no account made, nothing revealed.
		expect(burst.every((r) => r.ok && r.user === null)).toBe(true);
		const notices = await db
			.select({ id: emailOutbox.id })
			.from(emailOutbox)
			.where(and(eq(emailOutbox.toAddress, email), eq(emailOutbox.template, 'sign-up-existing')));
		expect(notices).toHaveLength(SIGN_UP_NOTICES);
	});
});

describe('quote and message throttling (counters in PostgreSQL)', () => {
	it('lets a parallel burst of quotes through up to the allowance and refuses the rest with 429', async () => {
		const { job } = await makeOpenJob(ADELAIDE);
		const installer = await makeInstaller({ base: ADELAIDE });
		const input = goodQuote(pricedParts(job));
		const burst = await Promise.all(
			Array.from({ length: QUOTE_SUBMISSIONS + 5 }, () => submitQuote(installer.id, job.id, input))
		);
		const refused = burst.filter((r) => !r.ok && r.status === 429);
		expect(refused).toHaveLength(5);
		expect(burst.filter((r) => r.ok)).toHaveLength(QUOTE_SUBMISSIONS);
		expect(!refused[0]!.ok && refused[0]!.message).toMatch(
			/Please wait \d+ minutes? and try again/
		);
		// The refused ones wrote nothing: one quote row, one revision per allowed submission.
		const [row] = await db.select().from(quote).where(eq(quote.jobId, job.id));
		expect(row?.revision).toBe(QUOTE_SUBMISSIONS);
	});

	it('lets a parallel burst of messages through up to the allowance and refuses the rest with 429', async () => {
		const { job, ownerId } = await makeOpenJob(ADELAIDE);
		const installer = await makeInstaller({ base: ADELAIDE });
		const sent = await submitQuote(installer.id, job.id, goodQuote(pricedParts(job)));
		expect(sent.ok).toBe(true);
		const burst = await Promise.all(
			Array.from({ length: MESSAGES_PER_WINDOW + 5 }, (_, i) =>
				postJobMessage(job.id, installer.id, { id: ownerId, role: 'owner' }, `Question ${i}`)
			)
		);
		expect(burst.filter((r) => !r.ok && r.status === 429)).toHaveLength(5);
		expect(burst.filter((r) => r.ok)).toHaveLength(MESSAGES_PER_WINDOW);
		const stored = await db.select().from(jobMessage).where(eq(jobMessage.jobId, job.id));
		expect(stored).toHaveLength(MESSAGES_PER_WINDOW);
	});
});

import { describe, expect, it } from 'vitest';
import {
	ACCOUNT_ATTEMPTS,
	ADDRESS_ATTEMPTS,
	checkSignInAllowed,
	recordFailedSignIn,
	recordSuccessfulSignIn
} from '$lib/server/rate-limit';

describe('sign-in throttling (counters in PostgreSQL)', () => {
	it('locks an account after its allowance of failures, for any address', async () => {
		const email = `locked.${Date.now()}@example.test`;
		for (let i = 0; i < ACCOUNT_ATTEMPTS; i++) {
			expect((await checkSignInAllowed(email, `10.0.0.${i}`)).allowed).toBe(true);
			await recordFailedSignIn(email, `10.0.0.${i}`);
		}
		const gate = await checkSignInAllowed(email.toUpperCase(), '10.9.9.9');
		expect(gate.allowed).toBe(false);
		if (!gate.allowed) {
			expect(gate.retryAfterSeconds).toBeGreaterThan(0);
			expect(gate.retryAfterSeconds).toBeLessThanOrEqual(15 * 60);
		}
	});

	it('locks an address that sprays many accounts', async () => {
		const address = `198.51.100.${Date.now() % 250}`;
		for (let i = 0; i < ADDRESS_ATTEMPTS; i++)
			await recordFailedSignIn(`spray${i}@example.test`, address);
		expect((await checkSignInAllowed('someone.else@example.test', address)).allowed).toBe(false);
		expect((await checkSignInAllowed('someone.else@example.test', '203.0.113.1')).allowed).toBe(
			true
		);
	});

	it('clears the account counter after a successful sign-in', async () => {
		const email = `forgetful.${Date.now()}@example.test`;
		for (let i = 0; i < ACCOUNT_ATTEMPTS - 1; i++) await recordFailedSignIn(email, '192.0.2.7');
		await recordSuccessfulSignIn(email);
		await recordFailedSignIn(email, '192.0.2.8');
		expect((await checkSignInAllowed(email, '192.0.2.8')).allowed).toBe(true);
	});
});

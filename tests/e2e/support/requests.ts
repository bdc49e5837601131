/**
 * Plain HTTP helpers for the security tests: form posts as a browser without JavaScript sends them
 * (same-origin, no redirect following), fresh accounts, and read-only look-ups in the e2e
 * database (DATABASE_URL, as `npm test` sets it) to check that a refused request wrote nothing.
 */
import type { APIRequestContext, Browser } from '@playwright/test';
import pg from 'pg';
import { DEMO_PASSWORD, expect, uniqueEmail } from '../fixtures';

export const BASE_URL = process.env.BASE_URL ?? 'http://127.0.0.1:4000';

let pool: pg.Pool | undefined;

/** Runs one query against the database the app under test uses. */
export async function query<T extends pg.QueryResultRow>(sql: string, params: unknown[] = []) {
	if (!pool) {
		pool = new pg.Pool({ connectionString: process.env.DATABASE_URL, max: 2 });
		// A test that restarts PostgreSQL closes idle connections; that must not end the worker.
		pool.on('error', () => {});
	}
	return (await pool.query<T>(sql, params)).rows;
}

/** Closes the look-up pool (call in afterAll). */
export async function closeQueries() {
	await pool?.end();
	pool = undefined;
}

type Fields = Record<string, string | string[]>;

/**
 * What a browser sends with a form it posts itself: its origin, and an Accept that prefers HTML
 * (to a request that accepts anything, SvelteKit answers an action as JSON, as for `use:enhance`).
 */
export const BROWSER_HEADERS = { origin: BASE_URL, accept: 'text/html,application/xhtml+xml' };

/** Posts a form the way a browser does without JavaScript; redirects are returned, not followed. */
export function postForm(request: APIRequestContext, path: string, fields: Fields) {
	const form = new FormData();
	for (const [name, value] of Object.entries(fields)) {
		for (const v of Array.isArray(value) ? value : [value]) form.append(name, v);
	}
	return request.post(path, { form, headers: BROWSER_HEADERS, maxRedirects: 0 });
}

/** Posts a body that claims to be multipart but is not (no boundary in it). */
export function postBrokenMultipart(request: APIRequestContext, path: string) {
	return request.post(path, {
		headers: {
			...BROWSER_HEADERS,
			'content-type': 'multipart/form-data; boundary=----tapline-test-boundary'
		},
		data: 'this body has no parts and no closing boundary',
		maxRedirects: 0
	});
}

/**
 * A new account, signed in, in its own browser context; its address is marked confirmed so the
 * test does not depend on what an unconfirmed account may do.
 */
export async function newAccount(browser: Browser, role: 'owner' | 'installer', label: string) {
	const context = await browser.newContext({ baseURL: BASE_URL });
	const email = uniqueEmail(label);
	const res = await postForm(context.request, '/sign-up', {
		role,
		displayName: 'Testing Person',
		email,
		password: 'long enough passphrase'
	});
	expect(res.status()).toBe(303);
	const [row] = await query<{ id: string }>(
		`UPDATE "user" SET email_verified_at = now() WHERE email = $1 RETURNING id`,
		[email]
	);
	if (!row) throw new Error(`no account for ${email}`);
	// Sign-up starts no session (it answers a taken address alike); sign in as the user would.
	const signedIn = await postForm(context.request, '/sign-in', {
		email,
		password: 'long enough passphrase'
	});
	expect(signedIn.status()).toBe(303);
	return { context, request: context.request, email, id: row.id };
}

/** Signs an existing account in, in a browser context of its own (no page needed). */
export async function signedIn(browser: Browser, email: string, password = DEMO_PASSWORD) {
	const context = await browser.newContext({ baseURL: BASE_URL });
	const res = await postForm(context.request, '/sign-in', { email, password });
	expect(res.status()).toBe(303);
	return context;
}

/** A new installer with a saved application (so documents and insurance can be added). */
export async function newInstallerWithProfile(browser: Browser, label = 'installer') {
	const account = await newAccount(browser, 'installer', label);
	const res = await postForm(account.request, '/installer/application', {
		businessName: `Security Test Fitting ${Date.now().toString(36)}`,
		contactName: 'Testing Person',
		phone: '0412 345 678',
		abn: '51 824 753 556', // passes the ABN check (the often-quoted example, from memory)
		gstRegistered: 'yes',
		yearsInTrade: '5',
		skills: ['parking-mode'],
		workMode: 'mobile',
		workshopAddress: '',
		baseSuburb: 'Norwood'
	});
	expect(res.status(), await res.text()).toBe(303);
	return account;
}

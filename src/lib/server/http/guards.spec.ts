import { describe, expect, it } from 'vitest';
import { REDIRECT_TO_MAX_LENGTH } from '$lib/forms/auth';
import { areaFor, normalisePath, signInUrl } from './guards';

describe('role areas, however the path is spelled', () => {
	// Spellings a router or a browser may read as the same path (RFC 3986 section 2.1 percent-
	// encoding, WHATWG URL dot-segment and backslash handling).
	const spellings: Array<[string, string | undefined]> = [
		['/owner', 'owner'],
		['/owner/jobs/new', 'owner'],
		['/%6fwner/jobs', 'owner'],
		['/%6Fwner', 'owner'],
		['/%256fwner/jobs', 'owner'],
		['/OWNER/jobs', 'owner'],
		['//owner/jobs', 'owner'],
		['/./owner/jobs', 'owner'],
		['/x/../owner', 'owner'],
		['/%2e%2e/owner', 'owner'],
		['/\\owner', 'owner'],
		['/%5cowner', 'owner'],
		['/%69nstaller/jobs', 'installer'],
		['/%61dmin/team', 'admin'],
		['/admin%2fteam', 'admin'],
		['/owner/__data.json', 'owner'],
		['/', undefined],
		['/installers/abc', undefined],
		['/ownership', undefined],
		['/sign-in', undefined],
		['/%E0%A4%A', undefined]
	];

	it.each(spellings)('%s', (path, role) => {
		expect(areaFor(path)?.role).toBe(role);
	});

	it('normalises to the lower-case, decoded path', () => {
		expect(normalisePath('/%4Fwner//Jobs/./x/..')).toBe('/owner/jobs/');
	});
});

describe('signInUrl', () => {
	const back = (href: string) =>
		new URLSearchParams(signInUrl(new URL(href, 'http://tapline.test')).split('?')[1] ?? '').get(
			'redirectTo'
		);

	it('returns to the page and its query', () => {
		expect(back('/owner/jobs?page=2')).toBe('/owner/jobs?page=2');
	});

	it('drops a query that would make the return path longer than the sign-in form takes', () => {
		const path = `/owner/jobs?q=${'x'.repeat(REDIRECT_TO_MAX_LENGTH)}`;
		expect(back(path)).toBe('/owner/jobs');
	});

	it('leaves out a path that is too long by itself', () => {
		const href = `/owner/${'x'.repeat(REDIRECT_TO_MAX_LENGTH)}`;
		expect(signInUrl(new URL(href, 'http://tapline.test'))).toBe('/sign-in');
	});
});

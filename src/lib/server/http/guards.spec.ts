import { describe, expect, it } from 'vitest';
import { areaFor, normalisePath } from './guards';

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

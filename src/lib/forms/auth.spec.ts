import { describe, expect, it } from 'vitest';
import { safeRedirect } from './auth';

const ORIGIN = 'http://127.0.0.1:4000';

describe('safeRedirect', () => {
	it.each([
		['/owner/jobs/new', '/owner/jobs/new'],
		['/owner?sort=created&dir=asc', '/owner?sort=created&dir=asc'],
		['/installer/jobs#map', '/installer/jobs#map'],
		[`${ORIGIN}/owner`, '/'], // only paths are taken, even our own absolute URLs
		['/%09/other.example', '/%09/other.example'] // still encoded: a path on this site
	])('keeps a path on this site: %s', (target, expected) => {
		expect(safeRedirect(target, ORIGIN)).toBe(expected);
	});

	// What a browser makes of a Location header (WHATWG URL): tabs and newlines are dropped and a
	// backslash is a slash, so each of these would leave the site.
	it.each([
		'//other.example/',
		'/\t/other.example',
		'/\n/other.example',
		'/\r\n/other.example',
		'/\\other.example',
		'/\\/other.example',
		// dot segments collapse to a path that starts `//`, which a browser reads as another host
		'/..//evil.example/x',
		'/./..//evil.example/x',
		'/a/../..//evil.example/x',
		'/%2e%2e//evil.example/x',
		'/%2E%2E//evil.example/x',
		'/.%2e//evil.example/x',
		'/%2e.//evil.example/x',
		'/..//\\evil.example/x',
		'/../\\evil.example/x',
		'https://other.example/',
		'javascript:alert(1)',
		'other.example',
		'',
		null,
		undefined
	])('falls back for %j', (target) => {
		expect(safeRedirect(target, ORIGIN, '/home')).toBe('/home');
	});

	it('never returns a control character a header could not carry', () => {
		for (let code = 0; code < 32; code++) {
			const out = safeRedirect(`/owner${String.fromCharCode(code)}x`, ORIGIN);
			expect(/\p{Cc}/u.test(out)).toBe(false);
		}
	});
});

import { describe, expect, it } from 'vitest';
import { decodedPath } from './address';

describe('decodedPath', () => {
	// Percent-encoding and UTF-8 as RFC 3986 §2.1 and RFC 3629 define them.
	it.each([
		['/owner/jobs', '/owner/jobs'],
		['/owner/caf%C3%A9', '/owner/café'], // é, two bytes of UTF-8
		['/a%25FF', '/a%25FF'], // %25 is a literal percent sign, kept as SvelteKit keeps it
		['/a%20b', '/a b']
	])('%s reads as %s', (path, decoded) => {
		expect(decodedPath(path)).toBe(decoded);
	});

	it.each([
		'/owner/%FF', // 0xFF never appears in UTF-8
		'/owner/%C3%28', // a lead byte followed by a byte that cannot continue it
		'/owner/%E2%80', // cut short
		'/owner/%',
		'/owner/%ZZ'
	])('%s cannot be read', (path) => {
		expect(decodedPath(path)).toBeNull();
	});
});

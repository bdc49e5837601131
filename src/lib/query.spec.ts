import { describe, expect, it } from 'vitest';
import { queryString, sortHref } from './query';

describe('queryString', () => {
	it('keeps the base, applies changes and drops null ones', () => {
		const base = new URLSearchParams('status=applied&sort=oldest&page=3');
		expect(queryString(base, { page: '4' })).toBe('?status=applied&sort=oldest&page=4');
		expect(queryString(base, { status: null, page: '1' })).toBe('?sort=oldest&page=1');
		// The page's own params are not changed by building a link from them.
		expect(base.get('page')).toBe('3');
	});

	it('encodes values (application/x-www-form-urlencoded, WHATWG URL standard)', () => {
		expect(queryString({ q: 'Mount Barker & Hahndorf', empty: null })).toBe(
			'?q=Mount+Barker+%26+Hahndorf'
		);
		expect(queryString({ bounds: '138.5,-35.1' })).toBe('?bounds=138.5%2C-35.1');
	});

	it('gives an empty string when nothing is left', () => {
		expect(queryString({ sort: 'best' }, { sort: null })).toBe('');
		expect(queryString({})).toBe('');
	});
});

describe('sortHref', () => {
	const base = new URLSearchParams('sort=total&dir=asc&page=2&status=live');

	it('flips the direction of the column already sorted', () => {
		expect(sortHref(base, 'total', { sort: 'total', dir: 'asc' })).toBe(
			'?sort=total&dir=desc&status=live'
		);
		expect(sortHref({ sort: 'total' }, 'total', { sort: 'total', dir: 'desc' })).toBe(
			'?sort=total&dir=asc'
		);
	});

	it("leaves another column's direction to the server and starts paging again", () => {
		expect(sortHref(base, 'distance', { sort: 'total', dir: 'asc' })).toBe(
			'?sort=distance&status=live'
		);
		expect(
			sortHref({ cursor: 'abc', sort: 'newest' }, 'quotes', { sort: 'newest', dir: null })
		).toBe('?sort=quotes');
	});
});

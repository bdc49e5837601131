import { describe, expect, it } from 'vitest';
import { decodeCursor, encodeCursor, pageAfter } from './paging';

describe('cursor paging', () => {
	const rows = [
		{ id: 'a', d: 3 },
		{ id: 'b', d: 1 },
		{ id: 'c', d: 2 },
		{ id: 'd', d: 2 },
		{ id: 'e', d: 5 }
	];

	it('round-trips a cursor and rejects garbage', () => {
		expect(decodeCursor(encodeCursor(2.5, 'x-1'))).toEqual({ value: 2.5, id: 'x-1' });
		expect(decodeCursor('not a cursor')).toBeNull();
		expect(decodeCursor(btoa('{"a":1}'))).toBeNull();
	});

	it('walks every row once, in order, ties broken by id', () => {
		const seen: string[] = [];
		let cursor: string | null = null;
		do {
			const after: { value: number | string; id: string } | null = cursor
				? decodeCursor(cursor)
				: null;
			const result: { page: typeof rows; nextCursor: string | null } = pageAfter(
				rows,
				(r) => r.d,
				'asc',
				after,
				2
			);
			seen.push(...result.page.map((r) => r.id));
			cursor = result.nextCursor;
		} while (cursor);
		expect(seen).toEqual(['b', 'c', 'd', 'a', 'e']);
		expect(pageAfter(rows, (r) => r.d, 'desc', null, 3).page.map((r) => r.id)).toEqual([
			'e',
			'a',
			'c'
		]);
	});
});

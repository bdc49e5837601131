/** Keyset paging for lists sorted by one value then id. Pure. */

/**
 * A keyset cursor for lists sorted by one value then id: opaque to clients (base64url JSON).
 * @param value the sort value of the last row sent
 * @param id the id of the last row sent
 */
export function encodeCursor(value: number | string, id: string): string {
	return btoa(JSON.stringify([value, id]))
		.replace(/\+/g, '-')
		.replace(/\//g, '_')
		.replace(/=+$/, '');
}

/**
 * Reads a cursor made by {@link encodeCursor}; null when it is not one.
 * @param cursor the client's cursor
 */
export function decodeCursor(cursor: string): { value: number | string; id: string } | null {
	try {
		const padded = cursor.replace(/-/g, '+').replace(/_/g, '/');
		const parsed: unknown = JSON.parse(atob(padded));
		if (
			Array.isArray(parsed) &&
			parsed.length === 2 &&
			(typeof parsed[0] === 'number' || typeof parsed[0] === 'string') &&
			typeof parsed[1] === 'string'
		) {
			return { value: parsed[0], id: parsed[1] };
		}
		return null;
	} catch {
		return null;
	}
}

/**
 * One page of rows sorted by (value, id), starting after the cursor.
 * @param rows all rows, in any order
 * @param key the sort value of a row
 * @param dir ascending or descending by value (ids always ascending within a value)
 * @param after the decoded cursor, or null for the first page
 * @param limit page size
 */
export function pageAfter<T extends { id: string }>(
	rows: readonly T[],
	key: (row: T) => number | string,
	dir: 'asc' | 'desc',
	after: { value: number | string; id: string } | null,
	limit: number
): { page: T[]; nextCursor: string | null } {
	const sign = dir === 'asc' ? 1 : -1;
	const compare = (a: number | string, aId: string, b: number | string, bId: string) =>
		(a < b ? -1 : a > b ? 1 : 0) * sign || (aId < bId ? -1 : aId > bId ? 1 : 0);
	const sorted = [...rows].sort((a, b) => compare(key(a), a.id, key(b), b.id));
	const rest = after
		? sorted.filter((r) => compare(key(r), r.id, after.value, after.id) > 0)
		: sorted;
	const page = rest.slice(0, limit);
	const last = page.at(-1);
	return {
		page,
		nextCursor: rest.length > limit && last ? encodeCursor(key(last), last.id) : null
	};
}

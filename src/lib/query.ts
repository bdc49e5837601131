/**
 * Query strings for links and fetches, always through `URLSearchParams` so every value is encoded
 * the same way. Pure: the pages (server and browser) and the tests use it.
 */

/** What a query can start from: the page's own search params or plain pairs. */
export type QueryBase = URLSearchParams | Record<string, string | null | undefined>;

/** Sort directions as the URL spells them. */
export type SortDirection = 'asc' | 'desc';

/** Drops the keys whose value is null or undefined. */
function pairs(record: Record<string, string | null | undefined>): [string, string][] {
	return Object.entries(record).filter((e): e is [string, string] => e[1] != null);
}

/**
 * `?a=1&b=2`: the base with `changes` applied (a null change removes the key); `''` when nothing
 * is left, so a link to the bare page stays a bare link.
 */
export function queryString(
	base: QueryBase,
	changes: Record<string, string | null | undefined> = {}
): string {
	const params = new URLSearchParams(base instanceof URLSearchParams ? base : pairs(base));
	for (const [key, value] of Object.entries(changes)) {
		if (value == null) params.delete(key);
		else params.set(key, value);
	}
	const text = params.toString();
	return text ? `?${text}` : '';
}

/** Keys a new sort makes meaningless: the page number and the board's cursor. */
const PAGING_KEYS = ['page', 'cursor'] as const;

/**
 * The link a sortable column header points to: sort by `key`; the column already sorted flips its
 * direction, any other column drops `dir` so the server's own default for it applies. Paging
 * starts again from the first page.
 */
export function sortHref(
	base: QueryBase,
	key: string,
	current: { sort: string; dir: SortDirection | null | undefined }
): string {
	const changes: Record<string, string | null> = Object.fromEntries(
		PAGING_KEYS.map((k) => [k, null])
	);
	changes.sort = key;
	changes.dir = key === current.sort ? (current.dir === 'asc' ? 'desc' : 'asc') : null;
	return queryString(base, changes);
}

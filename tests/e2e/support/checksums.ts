/**
 * One checksum per table of the app's schema, to show that requests which were refused changed no
 * row. Rate-limit counters (which every request may move) and the migration journal are left out;
 * sessions and the outbox are compared by their ids only (a session's expiry is extended on use,
 * an outbox row is marked sent in the background).
 */
import { query } from './requests';

const SKIPPED_TABLES = new Set(['rate_limit', '__drizzle_migrations']);
const ID_ONLY_TABLES = new Set(['session', 'email_outbox']);
let checksumSql = '';

export async function tableChecksums(): Promise<Record<string, string>> {
	if (!checksumSql) {
		const tables = await query<{ name: string }>(
			`SELECT table_name AS name FROM information_schema.tables
			 WHERE table_schema = 'public' AND table_type = 'BASE TABLE' ORDER BY table_name`
		);
		checksumSql =
			'SELECT ' +
			tables
				.filter((t) => !SKIPPED_TABLES.has(t.name))
				.map(({ name }) => {
					const value = ID_ONLY_TABLES.has(name) ? 't.id::text' : 't::text';
					return `(SELECT md5(coalesce(string_agg(${value}, ',' ORDER BY ${value}), '')) FROM "${name}" t) AS "${name}"`;
				})
				.join(',\n');
	}
	const [row] = await query<Record<string, string>>(checksumSql);
	return row!;
}

/** The tables whose checksum differs between two readings. */
export function changedTables(before: Record<string, string>, after: Record<string, string>) {
	return Object.keys(before).filter((table) => before[table] !== after[table]);
}

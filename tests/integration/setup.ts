// Gives each integration test file its own database, copied from the migrated template that
// global-setup.ts prepared, and drops it afterwards. Files run in parallel without seeing each other.
import { randomBytes } from 'node:crypto';
import pg from 'pg';
import { afterAll, inject } from 'vitest';

const adminUrl = inject('adminDatabaseUrl');
const template = inject('templateDatabase');
const prefix = inject('databaseUrlPrefix');

const name = `${template.replace(/_template$/, '')}_${randomBytes(4).toString('hex')}`;

async function admin<T>(fn: (c: pg.Client) => Promise<T>): Promise<T> {
	const client = new pg.Client({ connectionString: adminUrl });
	await client.connect();
	try {
		return await fn(client);
	} finally {
		await client.end();
	}
}

// Copies from one template can collide when two workers start at the same instant: retry briefly.
for (let attempt = 0; ; attempt++) {
	try {
		await admin((c) => c.query(`CREATE DATABASE "${name}" TEMPLATE "${template}"`));
		break;
	} catch (err) {
		if (attempt >= 10) throw err;
		await new Promise((r) => setTimeout(r, 200 + Math.random() * 300));
	}
}
process.env.DATABASE_URL = `${prefix}${name}`;

afterAll(async () => {
	const { pool } = await import('$lib/server/db');
	await pool.end();
	await admin((c) => c.query(`DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`));
});

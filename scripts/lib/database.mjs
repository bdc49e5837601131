// @ts-nocheck -- plain-JS orchestration that runs before npm ci; type-checked by its own use, not by tsc
// Databases on the cluster: create, drop, migrate, seed. Loaded after `npm ci`, so it may use packages.
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import pg from 'pg';
import path from 'node:path';
import { ROOT } from './config.mjs';

const ident = (name) => {
	if (!/^[a-z_][a-z0-9_]*$/.test(name)) throw new Error(`Unsafe database name: ${name}`);
	return `"${name}"`;
};

async function withAdmin(adminUrl, fn) {
	const client = new pg.Client({ connectionString: adminUrl });
	await client.connect();
	try {
		return await fn(client);
	} finally {
		await client.end();
	}
}

/** Creates the database unless it exists (optionally as a copy of a template). */
export async function ensureDatabase(adminUrl, name, template) {
	await withAdmin(adminUrl, async (client) => {
		const { rowCount } = await client.query('SELECT 1 FROM pg_database WHERE datname = $1', [name]);
		if (rowCount) return;
		await client.query(
			`CREATE DATABASE ${ident(name)}${template ? ` TEMPLATE ${ident(template)}` : ''}`
		);
	});
}

/** Drops a database, closing any connection still open to it. */
export async function dropDatabase(adminUrl, name) {
	await withAdmin(adminUrl, (client) =>
		client.query(`DROP DATABASE IF EXISTS ${ident(name)} WITH (FORCE)`)
	);
}

/** Applies the committed drizzle migrations. */
export async function migrateDatabase(url) {
	const pool = new pg.Pool({ connectionString: url, max: 1 });
	try {
		await migrate(drizzle(pool), { migrationsFolder: path.join(ROOT, 'drizzle') });
	} finally {
		await pool.end();
	}
}

/**
 * Loads the demo scenario when the database has no accounts yet, through `run` (a report's run).
 * Returns 'loaded' or 'already there'. The check is a query here, so a later start does not pay
 * for starting Vite; the seed checks again itself. It runs through scripts/run-ts.mjs, which needs
 * nothing generated (no `.svelte-kit`, no build), so a fresh clone seeds before its first build. `storageEnv` (S3_ENDPOINT and the rest) lets
 * the seed store the demo documents' files, so the object store must be running first.
 */
export async function seedDatabase(url, run, storageEnv = {}) {
	const client = new pg.Client({ connectionString: url });
	await client.connect();
	try {
		const { rows } = await client.query('SELECT EXISTS (SELECT 1 FROM "user") AS any');
		if (rows[0]?.any) return 'already there';
	} finally {
		await client.end();
	}
	const output = await run(process.execPath, ['scripts/run-ts.mjs', 'seed/index.ts'], {
		env: { ...storageEnv, DATABASE_URL: url }
	});
	return /skipped/.test(output) ? 'already there' : 'loaded';
}

/** True when every account of the demo tour (src/lib/demo-tour.js) exists with its role. */
export async function hasDemoAccounts(url, accounts) {
	const client = new pg.Client({ connectionString: url });
	await client.connect();
	try {
		const { rows } = await client.query(
			'SELECT count(*)::int AS n FROM "user" u JOIN unnest($1::text[], $2::text[]) AS t(email, role) ON u.email = t.email AND u.role::text = t.role',
			[accounts.map((a) => a.email), accounts.map((a) => a.role)]
		);
		return rows[0]?.n === accounts.length;
	} finally {
		await client.end();
	}
}

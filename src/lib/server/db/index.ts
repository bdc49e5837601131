import { drizzle } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import { building } from '$app/environment';
import { env } from '$env/dynamic/private';
import * as schema from './schema';

if (!env.DATABASE_URL && !building) {
	throw new Error('DATABASE_URL is not set: copy .env.example to .env or start with `npm start`.');
}

/** The one connection pool of this process. */
export const pool = new pg.Pool({ connectionString: env.DATABASE_URL, max: 10 });

/** The one Drizzle handle of this process. */
export const db = drizzle(pool, { schema, casing: 'snake_case' });

export type Db = typeof db;
/** A transaction handle, for functions that must join the caller's transaction. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

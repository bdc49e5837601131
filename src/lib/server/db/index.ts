import { drizzle } from 'drizzle-orm/node-postgres';
import pg from 'pg';
import { building } from '$app/environment';
import { env } from '$env/dynamic/private';
import * as schema from './schema';

if (!env.DATABASE_URL && !building) {
	throw new Error('DATABASE_URL is not set: copy .env.example to .env or start with `npm start`.');
}

/**
 * The one connection pool of this process. A connection that PostgreSQL closes (restart,
 * failover, maintenance) emits 'error'; unheard, that event ends the process, so the pool and
 * every client it opens log it instead. The pool drops broken clients and opens fresh ones when
 * the database answers again; meanwhile requests fail and hooks.server.ts answers them with 503.
 */
export const pool = new pg.Pool({
	connectionString: env.DATABASE_URL,
	max: 10,
	// A database that does not answer at all (network gone) fails a request in seconds, not never.
	connectionTimeoutMillis: 5_000,
	// No JIT and no parallel workers: every query here is a short indexed read or write. PostGIS's
	// high function costs push the board's plans over jit_above_cost, where compiling took seconds,
	// and starting workers cost more than the page they shared (npm run bench, bench/RESULTS.md).
	options: '-c jit=off -c max_parallel_workers_per_gather=0'
});
pool.on('error', (err) => console.error('[db] idle connection lost:', err.message));
// pg-pool listens on a client only while it is idle; a client checked out between two queries of
// a transaction needs its own listener. Its next query then fails and the pool discards it.
pool.on('connect', (client) => {
	client.on('error', (err) => console.error('[db] connection lost:', err.message));
});

/** The one Drizzle handle of this process. */
export const db = drizzle(pool, { schema, casing: 'snake_case' });

export type Db = typeof db;
/** A transaction handle, for functions that must join the caller's transaction. */
export type Tx = Parameters<Parameters<Db['transaction']>[0]>[0];

import pg from 'pg';
import { drizzle, type NodePgDatabase } from 'drizzle-orm/node-postgres';
import * as schema from './schema';
import { getEnv } from '../env';

export type Database = NodePgDatabase<typeof schema>;
/** A database handle or an open transaction: queries accept either. */
export type Executor = Database | Parameters<Parameters<Database['transaction']>[0]>[0];

let pool: pg.Pool | null = null;
let database: Database | null = null;

/** The shared pool, created on first use (never at import time). */
export function getPool(): pg.Pool {
	if (!pool) {
		pool = new pg.Pool({
			connectionString: getEnv().DATABASE_URL,
			max: 10,
			connectionTimeoutMillis: 3000,
			idleTimeoutMillis: 30000
		});
		// An idle client losing its connection (database restarted) must not crash the
		// process; the pool opens a new connection on the next query.
		pool.on('error', (err) => console.error('[db] idle connection error:', err.message));
	}
	return pool;
}

/** The Drizzle handle over the shared pool. */
export function getDb(): Database {
	if (!database) database = drizzle(getPool(), { schema, casing: 'snake_case' });
	return database;
}

/** Closes the pool (shutdown and tests). */
export async function closeDb(): Promise<void> {
	const p = pool;
	pool = null;
	database = null;
	if (p) await p.end();
}

/** True when an error means the database could not be reached. */
export function isDatabaseUnavailable(err: unknown): boolean {
	const seen = new Set<unknown>();
	let cur: unknown = err;
	while (cur && typeof cur === 'object' && !seen.has(cur)) {
		seen.add(cur);
		const code = (cur as { code?: unknown }).code;
		const message = String((cur as { message?: unknown }).message ?? '');
		if (code === 'ECONNREFUSED' || code === '57P01' || code === '57P03' || code === 'ETIMEDOUT') return true;
		if (/ECONNREFUSED|Connection terminated|timeout exceeded when trying to connect/i.test(message)) return true;
		cur = (cur as { cause?: unknown }).cause;
	}
	return false;
}

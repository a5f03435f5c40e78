import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { sql } from 'drizzle-orm';
import { getDb } from '$lib/server/db/client';

// Public liveness and database check, for people and monitors.
export const GET: RequestHandler = async () => {
	const started = performance.now();
	try {
		await getDb().execute(sql`select 1`);
		return json({ status: 'ok', database: 'ok', latency_ms: Math.round(performance.now() - started) });
	} catch (e) {
		return json(
			{ status: 'unavailable', database: 'unreachable', message: `The database does not answer: ${(e as Error).message}` },
			{ status: 503, headers: { 'retry-after': '10' } }
		);
	}
};

import { describe, expect, it } from 'vitest';
import pg from 'pg';
import { isDatabaseUnavailable } from '../../src/lib/server/db/client';

describe('database outage detection', () => {
	it('recognises a refused connection as "database unavailable"', async () => {
		// Port 9 (discard) on loopback has no PostgreSQL: the connection is refused.
		const client = new pg.Client({ host: '127.0.0.1', port: 9, user: 'x', database: 'x', connectionTimeoutMillis: 1000 });
		const err = await client.connect().then(
			() => null,
			(e: unknown) => e
		);
		expect(err).not.toBeNull();
		expect(isDatabaseUnavailable(err)).toBe(true);
	});

	it('does not mistake an SQL error for an outage', async () => {
		const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
		await client.connect();
		const err = await client.query('select * from no_such_table').then(
			() => null,
			(e: unknown) => e
		);
		await client.end();
		expect(isDatabaseUnavailable(err)).toBe(false);
	});
});

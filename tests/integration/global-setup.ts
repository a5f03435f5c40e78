import pg from 'pg';

// Integration tests need the real test database prepared by `npm test` (scripts/test.mjs):
// fail early with a clear message instead of a pile of connection errors.
export default async function setup(): Promise<void> {
	const url = process.env.DATABASE_URL;
	if (!url) throw new Error('DATABASE_URL is not set: run integration tests through `npm test` or `npm run test:integration`.');
	const client = new pg.Client({ connectionString: url, connectionTimeoutMillis: 3000 });
	try {
		await client.connect();
		await client.query('select 1 from users limit 1');
	} catch (e) {
		throw new Error(`The integration database at ${url} is not ready (${(e as Error).message}). Run \`npm run test:integration\`.`);
	} finally {
		await client.end().catch(() => undefined);
	}
}

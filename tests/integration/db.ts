import { afterAll } from 'vitest';
import { closeDb, getDb, type Executor } from '../../src/lib/server/db/client';

class Rollback extends Error {}

/**
 * Runs `fn` inside a transaction that is always rolled back, so every test starts from
 * the same empty (migrated) database. Services open savepoints inside it.
 */
export async function inRollback(fn: (tx: Executor) => Promise<void>): Promise<void> {
	try {
		await getDb().transaction(async (tx) => {
			await fn(tx);
			throw new Rollback();
		});
	} catch (e) {
		if (!(e instanceof Rollback)) throw e;
	}
}

afterAll(async () => {
	await closeDb();
});

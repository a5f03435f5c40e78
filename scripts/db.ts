// Database tasks for npm start / npm test: `tsx scripts/db.ts migrate|seed`.
// Reads DATABASE_URL through the app's own config module.
import { getDb, closeDb } from '../src/lib/server/db/client';
import { runMigrations } from '../src/lib/server/db/migrate';
import { seedDemo } from '../src/lib/server/services/seed';

const task = process.argv[2];
try {
	if (task === 'migrate') {
		await runMigrations(getDb());
		console.log('[db] migrations applied');
	} else if (task === 'seed') {
		const r = await seedDemo(getDb());
		console.log(`[db] demo seed: ${r.created === 0 ? 'already present, nothing changed' : `${r.created} rows created`}`);
	} else {
		console.error('usage: tsx scripts/db.ts migrate|seed');
		process.exitCode = 2;
	}
} catch (e) {
	console.error(`[db] ${task} failed: ${(e as Error).message}`);
	process.exitCode = 1;
} finally {
	await closeDb();
}

// `npm run db:migrate` / `npm run db:seed`: run one database task against the dev cluster,
// starting it for the task (and stopping it again) when it is not already running.
import { ensureNodeModules, migrateAndSeed, projectDir, syncKit } from './setup.mjs';

const task = process.argv[2];
if (task !== 'migrate' && task !== 'seed') {
	console.error('usage: node scripts/with-services.mjs migrate|seed');
	process.exit(2);
}
ensureNodeModules();
const { startPostgres, stopPostgres, ensureDatabase, databaseUrl } = await import('./postgres.mjs');
const port = Number(process.env.PGPORT_DEV ?? 54329);
const db = await startPostgres({ projectDir, name: 'dev', port, durable: true });
try {
	await ensureDatabase(port, 'phasewright');
	syncKit();
	migrateAndSeed(process.env.DATABASE_URL ?? databaseUrl(port, 'phasewright'), { seed: task === 'seed' });
} finally {
	if (db.startedByUs) stopPostgres(db);
}

// `npm start`: install what is missing, start PostgreSQL (and, inside the app, the mail
// fake), migrate, seed the demo, build and serve. Ctrl-C stops everything it started.
import { spawn } from 'node:child_process';
import { ensureNodeModules, migrateAndSeed, projectDir, sh, syncKit, viteBin } from './setup.mjs';

ensureNodeModules();
const { startPostgres, stopPostgres, ensureDatabase, databaseUrl } = await import('./postgres.mjs');

const port = Number(process.env.PORT ?? 5173);
const pgPort = Number(process.env.PGPORT_DEV ?? 54329);
const mailPort = Number(process.env.MAIL_FAKE_PORT ?? 2525);
const db = await startPostgres({ projectDir, name: 'dev', port: pgPort, durable: true });
let stopped = false;
const stopDb = () => {
	if (stopped) return;
	stopped = true;
	if (db.startedByUs) {
		console.log('[start] stopping PostgreSQL …');
		stopPostgres(db);
	}
};
try {
	await ensureDatabase(pgPort, 'phasewright');
	const url = process.env.DATABASE_URL ?? databaseUrl(pgPort, 'phasewright');
	syncKit();
	migrateAndSeed(url, { seed: true });
	console.log('[start] building the app …');
	sh(viteBin, ['build', '--logLevel', 'warn']);
	const app = spawn(process.execPath, ['build'], {
		cwd: projectDir,
		stdio: 'inherit',
		env: { ...process.env, DATABASE_URL: url, PORT: String(port), HOST: process.env.HOST ?? '127.0.0.1', ORIGIN: process.env.ORIGIN ?? `http://127.0.0.1:${port}`, APP_BASE_URL: process.env.APP_BASE_URL ?? `http://127.0.0.1:${port}`, MAIL_FAKE_PORT: String(mailPort) }
	});
	const origin = `http://127.0.0.1:${port}`;
	console.log(`
Phasewright is running at ${origin}

Demo accounts (sign in with the address; the link arrives in the mailbox):
  ada@stellar-nurseries.example     member    (Stellar Nurseries Survey)
  ravi@stellar-nurseries.example    reviewer
  lena@stellar-nurseries.example    lead
  tomas@tidewater.example           lead      (Tidewater Transients)
  admin@phasewright.example         site admin
Mailbox (development only): ${origin}/dev/mailbox
Press Ctrl-C to stop.
`);
	const shutdown = () => app.kill('SIGTERM');
	process.on('SIGINT', shutdown);
	process.on('SIGTERM', shutdown);
	await new Promise((resolve) => app.on('exit', resolve));
} finally {
	stopDb();
}

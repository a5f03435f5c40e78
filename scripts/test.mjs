// `npm test`: the same set-up as `npm start` against separate test databases, then every
// layer: type check, unit (incl. golden and rendered-program tests), integration (real
// PostgreSQL), end-to-end (Playwright in Debian's Chromium against the built app).
// `--only unit|check|integration|e2e` runs one layer.
import {
	binPath,
	ensureChromium,
	ensureNodeModules,
	ensurePythonNumpy,
	migrateAndSeed,
	projectDir,
	sh,
	shStatus,
	syncKit,
	viteBin
} from './setup.mjs';

const onlyIdx = process.argv.indexOf('--only');
const only = onlyIdx >= 0 ? process.argv[onlyIdx + 1] : null;
const wants = (layer) => only === null || only === layer;

ensureNodeModules();
if (wants('unit') || wants('e2e')) ensurePythonNumpy();
if (wants('e2e')) ensureChromium();
const { startPostgres, stopPostgres, recreateDatabase, databaseUrl } = await import('./postgres.mjs');

const pgPort = Number(process.env.PGPORT_TEST ?? 54339);
const results = [];
let db = null;
try {
	syncKit();
	if (wants('check')) results.push(['type check', await shStatus(binPath('svelte-check'), ['--tsconfig', './tsconfig.json', '--threshold', 'error', '--output', 'human'])]);
	if (wants('unit')) results.push(['unit', await shStatus(binPath('vitest'), ['run', '--project', 'unit'])]);
	if (wants('integration') || wants('e2e')) db = await startPostgres({ projectDir, name: 'test', port: pgPort, durable: false });
	if (wants('integration')) {
		await recreateDatabase(pgPort, 'phasewright_it');
		const url = databaseUrl(pgPort, 'phasewright_it');
		migrateAndSeed(url, { seed: false });
		results.push(['integration', await shStatus(binPath('vitest'), ['run', '--project', 'integration'], { DATABASE_URL: url, MAIL_FAKE_PORT: process.env.IT_MAIL_PORT ?? '2545' })]);
	}
	if (wants('e2e')) {
		await recreateDatabase(pgPort, 'phasewright_e2e');
		const url = databaseUrl(pgPort, 'phasewright_e2e');
		migrateAndSeed(url, { seed: true });
		sh(viteBin, ['build', '--logLevel', 'warn']);
		results.push(['end-to-end', await shStatus(binPath('playwright'), ['test'], { DATABASE_URL: url, E2E_PORT: process.env.E2E_PORT ?? '4183', MAIL_FAKE_PORT: process.env.E2E_MAIL_PORT ?? '2535' })]);
	}
} catch (e) {
	console.error(`\n[test] set-up failed: ${e.message}`);
	results.push(['set-up', 1]);
} finally {
	if (db?.startedByUs) stopPostgres(db);
}

const failed = results.filter(([, code]) => code !== 0);
console.log('\nTest layers:');
for (const [name, code] of results) console.log(`  ${code === 0 ? 'ok  ' : 'FAIL'} ${name}`);
console.log(`layers: ${results.length - failed.length} passed, ${failed.length} failed`);
process.exit(failed.length === 0 ? 0 : 1);

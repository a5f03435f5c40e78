// bench:web — the wizard's review screen in Chromium against the built app on loopback:
// time from a parameter change to updated findings and program (median of repeated edits),
// beside the floor of the same two API calls made directly from the page, and the
// JavaScript shipped to the page (gzip bytes). Prints figures; asserts nothing.
import { spawn, type ChildProcess } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { gzipSync } from 'node:zlib';
import { chromium } from '@playwright/test';
import pg from 'pg';
import { median } from './measure';
// @ts-expect-error plain ESM helpers without types
import { ensureChromium, migrateAndSeed, projectDir, sh, syncKit, viteBin } from '../scripts/setup.mjs';
// @ts-expect-error plain ESM helpers without types
import { startPostgres, stopPostgres, recreateDatabase, databaseUrl } from '../scripts/postgres.mjs';

const PG_PORT = 54359;
const APP_PORT = 4193;
const EDITS = 25;
const base = `http://127.0.0.1:${APP_PORT}`;


// In-page code is passed as source text: the TypeScript runner rewrites functions it compiles.
const EDIT_AND_WAIT = `async function (t) {
	const input = document.querySelector('input[name="title"]');
	const viewer = document.querySelector('[data-testid="code-viewer"]');
	if (!input || !viewer) throw new Error('review screen not found');
	const t0 = performance.now();
	const done = new Promise(function (resolve) {
		const obs = new MutationObserver(function () {
			if (viewer.textContent && viewer.textContent.includes(t)) { obs.disconnect(); resolve(performance.now() - t0); }
		});
		obs.observe(viewer, { subtree: true, childList: true, characterData: true });
	});
	input.value = t;
	input.dispatchEvent(new Event('input', { bubbles: true }));
	return done;
}`;
const API_FLOOR = `async function (body) {
	const t0 = performance.now();
	const post = function (u) { return fetch(u, { method: 'POST', headers: { 'content-type': 'application/json' }, body: body }).then(function (r) { return r.json(); }); };
	await Promise.all([post('/api/v1/validate'), post('/api/v1/render')]);
	return performance.now() - t0;
}`;

async function waitFor(url: string, ms: number): Promise<void> {
	const end = Date.now() + ms;
	while (Date.now() < end) {
		try {
			if ((await fetch(url)).ok) return;
		} catch {
			// not up yet
		}
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error(`${url} did not answer within ${ms} ms`);
}

ensureChromium();
const cluster = await startPostgres({ projectDir, name: 'bench', port: PG_PORT, durable: false });
let app: ChildProcess | null = null;
try {
	await recreateDatabase(PG_PORT, 'phasewright_bench');
	const url = databaseUrl(PG_PORT, 'phasewright_bench');
	syncKit();
	migrateAndSeed(url, { seed: true });
	sh(viteBin, ['build', '--logLevel', 'error']);
	app = spawn(process.execPath, ['build'], {
		cwd: projectDir,
		stdio: 'ignore',
		env: { ...process.env, DATABASE_URL: url, PORT: String(APP_PORT), HOST: '127.0.0.1', ORIGIN: base, MAIL_FAKE_PORT: '2555', APP_BASE_URL: base }
	});
	await waitFor(`${base}/healthz`, 30_000);

	const db = new pg.Client({ connectionString: url });
	await db.connect();
	const token = randomUUID();
	const ada = await db.query<{ id: string }>("select id from users where email = 'ada@stellar-nurseries.example'");
	await db.query("insert into sessions (session_token, user_id, expires) values ($1, $2, now() + interval '1 day')", [token, ada.rows[0]?.id]);
	const obs = await db.query<{ id: string; team_id: string }>("select id, team_id from observations where original_filename = 'corrie-flats-demo.json'");
	await db.end();
	const cookie = `authjs.session-token=${token}`;
	const created = await fetch(`${base}/api/v1/teams/${obs.rows[0]?.team_id}/recipes`, {
		method: 'POST',
		headers: { cookie, 'content-type': 'application/json' },
		body: JSON.stringify({ observation_id: obs.rows[0]?.id, title: 'Bench recipe' })
	});
	const { id } = (await created.json()) as { id: string };

	const browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: ['--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'] });
	const context = await browser.newContext();
	await context.addCookies([{ name: 'authjs.session-token', value: token, url: base }]);
	const page = await context.newPage();
	const scripts = new Map<string, number>();
	page.on('response', async (res) => {
		if (res.request().resourceType() !== 'script') return;
		try {
			scripts.set(res.url(), gzipSync(await res.body(), { level: 9 }).length);
		} catch {
			// a redirect or an aborted response has no body
		}
	});
	await page.goto(`${base}/recipes/${id}/edit/review`, { waitUntil: 'networkidle' });
	await page.waitForSelector('html[data-hydrated="true"]');
	await page.waitForSelector('[data-editor-ready="true"]', { timeout: 15_000 }).catch(() => undefined);
	await page.waitForLoadState('networkidle');
	const jsGzip = [...scripts.values()].reduce((a, b) => a + b, 0);

	const ui: number[] = [];
	const floor: number[] = [];
	for (let i = 0; i < EDITS; i++) {
		const title = `Bench recipe edit ${i} ${randomUUID().slice(0, 8)}`;
		// Edit → findings and program shown, measured inside the page.
		ui.push((await page.evaluate(`(${EDIT_AND_WAIT})(${JSON.stringify(title)})`)) as number);
	}
	// Floor: the same two API calls with the same draft, made directly from the page.
	const dbDraft = new pg.Client({ connectionString: url });
	await dbDraft.connect();
	const d = await dbDraft.query<{ draft: unknown; observation_id: string }>('select draft, observation_id from recipes where id = $1', [id]);
	await dbDraft.end();
	for (let i = 0; i < EDITS; i++) {
		const recipe = { ...(d.rows[0]?.draft as Record<string, unknown>), title: `Bench floor ${i}` };
		const body = JSON.stringify({ recipe, observation_id: d.rows[0]?.observation_id });
		floor.push((await page.evaluate(`(${API_FLOOR})(${JSON.stringify(body)})`)) as number);
	}
	await browser.close();

	const result = {
		bench: 'web (review screen, edit → findings and program)',
		edits: EDITS,
		edit_to_update_median_ms: Number(median(ui).toFixed(1)),
		api_floor_median_ms: Number(median(floor).toFixed(1)),
		ratio_ui_to_api_floor: Number((median(ui) / Math.max(median(floor), 0.001)).toFixed(2)),
		javascript_gzip_kb: Number((jsGzip / 1024).toFixed(1)),
		script_files: scripts.size,
		targets: 'edit → update < 150 ms; JavaScript < 350 KB gzip'
	};
	console.log(JSON.stringify(result, null, 2));
} finally {
	app?.kill('SIGTERM');
	if (cluster.startedByUs) stopPostgres(cluster);
}

import { test, expect, seedSession, teamId, query, PEOPLE } from './fixtures';
import { request as pwRequest, type APIRequestContext } from '@playwright/test';
import { createHash } from 'node:crypto';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { createDefaultRecipe } from '../../src/lib/calibration/defaults';
import { createDemoObservation } from '../../src/lib/calibration/demo-observation';

// The planning and rendering API as a pipeline would use it: validate, preview, create a
// recipe, save a version, download its program and run `plan` with real python3.
let member: APIRequestContext;
let stranger: APIRequestContext;
let observationId: string;
let team: string;

test.beforeAll(async ({ baseURL }) => {
	team = await teamId('stellar-nurseries');
	const rows = await query<{ id: string }>("select id from observations where team_id = $1 and original_filename = 'corrie-flats-demo.json'", [team]);
	observationId = rows[0]?.id ?? '';
	member = await pwRequest.newContext({ baseURL, extraHTTPHeaders: { cookie: `authjs.session-token=${await seedSession(PEOPLE.member)}` } });
	stranger = await pwRequest.newContext({ baseURL, extraHTTPHeaders: { cookie: `authjs.session-token=${await seedSession(PEOPLE.otherLead)}` } });
});

test.afterAll(async () => {
	await member.dispose();
	await stranger.dispose();
});

test('validate: the demo default recipe has no errors against the stored demo observation', async () => {
	const recipe = createDefaultRecipe(createDemoObservation());
	const res = await member.post('/api/v1/validate', { data: { recipe, observation_id: observationId } });
	expect(res.status()).toBe(200);
	const body = (await res.json()) as { errors: number; findings: { code: string }[] };
	expect(body.errors).toBe(0);
	const broken = { ...recipe, reference_antenna: { primary: 'ZZ99', fallbacks: [] } };
	const bad = (await (await member.post('/api/v1/validate', { data: { recipe: broken, observation_id: observationId } })).json()) as { errors: number; findings: { code: string; path: string }[] };
	expect(bad.errors).toBeGreaterThan(0);
	expect(bad.findings.find((f) => f.code === 'refant.unknown')?.path).toBe('reference_antenna.primary');
});

test('validate: another team cannot use this team\'s observation, and a bad recipe is a 400 with paths', async () => {
	const recipe = createDefaultRecipe(createDemoObservation());
	expect((await stranger.post('/api/v1/validate', { data: { recipe, observation_id: observationId } })).status()).toBe(404);
	const res = await member.post('/api/v1/validate', { data: { recipe: { ...recipe, steps: 'none' } } });
	expect(res.status()).toBe(400);
	const body = (await res.json()) as { error: { code: string; issues: { path: string }[] } };
	expect(body.error.code).toBe('validation_failed');
	expect(body.error.issues[0]?.path).toMatch(/^\$\.recipe\.steps/);
});

test('render: a preview returns the program and its SHA-256', async () => {
	const recipe = createDefaultRecipe(createDemoObservation());
	const res = await member.post('/api/v1/render', { data: { recipe, observation_id: observationId } });
	expect(res.status()).toBe(200);
	const body = (await res.json()) as { program: string; sha256: string; template: { name: string; version: number } };
	// SHA-256 checked with Node's own implementation.
	expect(body.sha256).toBe(createHash('sha256').update(body.program, 'utf8').digest('hex'));
	expect(body.template.name).toBe('standard');
	expect(body.program).toContain('REFERENCE_ANTENNA = ');
});

test('versions: save, download the program, and run its plan with python3', async () => {
	const created = await member.post(`/api/v1/teams/${team}/recipes`, { data: { observation_id: observationId, title: 'API pipeline "check"' } });
	expect(created.status()).toBe(201);
	const { id } = (await created.json()) as { id: string };
	const saved = await member.post(`/api/v1/recipes/${id}/versions`, { data: { message: 'First version', base_revision: 1 } });
	expect(saved.status()).toBe(201);
	expect(((await saved.json()) as { version: number }).version).toBe(1);
	const stale = await member.post(`/api/v1/recipes/${id}/versions`, { data: { message: 'Stale', base_revision: 1 } });
	expect(stale.status()).toBe(409);

	const dl = await member.get(`/api/v1/recipes/${id}/versions/1/program`);
	expect(dl.status()).toBe(200);
	expect(dl.headers()['content-disposition']).toBe('attachment; filename="api-pipeline-check-v1.py"');
	const text = await dl.text();
	expect(dl.headers()['x-program-sha256']).toBe(createHash('sha256').update(text, 'utf8').digest('hex'));
	const dir = mkdtempSync(path.join(tmpdir(), 'pw-e2e-'));
	const file = path.join(dir, 'program.py');
	writeFileSync(file, text);
	const parsed = spawnSync('python3', ['-c', 'import ast,sys; ast.parse(open(sys.argv[1]).read())', file], { encoding: 'utf8' });
	expect(parsed.status, parsed.stderr).toBe(0);
	const plan = spawnSync('python3', [file, 'plan'], { encoding: 'utf8' });
	expect(plan.status, plan.stderr).toBe(0);
	expect(plan.stdout).toContain('API pipeline');

	expect((await stranger.get(`/api/v1/recipes/${id}/versions/1/program`)).status()).toBe(404);
	expect((await member.get(`/api/v1/recipes/${id}/versions/9/program`)).status()).toBe(404);
});

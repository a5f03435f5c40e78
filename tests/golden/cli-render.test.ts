/** The `render` command of the command line (scripts/cli-render.ts), run in-process on files. */
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { renderCommand, runRenderCommand, type RenderCommandIo } from '../../scripts/cli-render';
import { parseObservation } from '../../src/lib/calibration/observation';
import { createRecipeExport, recipeParamsSchema } from '../../src/lib/calibration/recipe';
import { runPythonJson } from '../../src/lib/script/python-test-harness';
import { paramsSha256 } from '../../src/lib/script/sha256';

const ROOT = join(import.meta.dirname, '..', '..');
const work = mkdtempSync(join(tmpdir(), 'phasewright-cli-render-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

const recipePath = join(import.meta.dirname, 'full-lband', 'recipe.json');
const recipe = recipeParamsSchema.parse(JSON.parse(readFileSync(recipePath, 'utf8')));

function writeJson(name: string, value: unknown): string {
	const path = join(work, name);
	writeFileSync(path, typeof value === 'string' ? value : JSON.stringify(value), 'utf8');
	return path;
}

async function run(args: string[]): Promise<{ code: number; out: string; err: string }> {
	let out = '';
	let err = '';
	const io: RenderCommandIo = { writeOut: (t) => (out += t), writeErr: (t) => (err += t), templatesDir: join(ROOT, 'templates') };
	const code = await runRenderCommand(args, io);
	return { code, out, err };
}

function makeExport(template: { name: string; version: number }): unknown {
	const observation = parseObservation(readFileSync(join(ROOT, 'tests', 'fixtures', 'observations', 'demo.json'), 'utf8'));
	if (!observation.ok) throw new Error('the demo observation fixture does not parse');
	return createRecipeExport({ title: recipe.title, observation: observation.value.summary, recipe, template });
}

describe('render command', () => {
	it('prints a program that python3 parses, carrying the recipe digest and title', async () => {
		const result = await run(['--recipe', recipePath]);
		expect(result.err).toBe('');
		expect(result.code).toBe(0);
		expect(result.out).toContain(`PARAMS_SHA256 = "${paramsSha256(recipe)}"`);
		const script = String.raw`
import ast, json, sys
program = json.load(open(sys.argv[1], encoding="utf-8"))
tree = ast.parse(program)
title = [ast.literal_eval(s.value) for s in tree.body if isinstance(s, ast.Assign) and getattr(s.targets[0], "id", "") == "TITLE"]
print(json.dumps(title))
`;
		expect(runPythonJson(script, result.out)).toEqual([recipe.title]);
	});

	it('renders a phasewright.recipe export the same as its bare parameters', async () => {
		const bare = await run(['--recipe', recipePath]);
		const exported = await run(['--recipe', writeJson('export.json', makeExport({ name: 'standard', version: 1 }))]);
		expect(exported.code).toBe(0);
		expect(exported.out).toBe(bare.out);
	});

	it('accepts a valid --observation file and rejects a malformed one with its issues', async () => {
		const demo = join(ROOT, 'tests', 'fixtures', 'observations', 'demo.json');
		expect((await run(['--recipe', recipePath, '--observation', demo])).code).toBe(0);
		const bad = await run(['--recipe', recipePath, '--observation', writeJson('obs.json', { format: 'something.else' })]);
		expect(bad.code).toBe(2);
		expect(bad.err).toMatch(/not a valid observation summary\n {2}\$\.format: /);
	});

	it('refuses template versions other than the starter set, from the flag or from an export', async () => {
		const flag = await run(['--recipe', recipePath, '--template', 'standard@2']);
		expect(flag.code).toBe(2);
		expect(flag.err).toMatch(/renders with the starter set \(standard@1, the files in templates\/\) only/);
		const fromExport = await run(['--recipe', writeJson('export2.json', makeExport({ name: 'team-special', version: 3 }))]);
		expect(fromExport.code).toBe(2);
		expect(fromExport.err).toContain('team-special@3');
		expect((await run(['--recipe', recipePath, '--template', 'standard@1'])).code).toBe(0);
	});

	// Exit codes follow scripts/cli.ts: 2 for bad arguments or unreadable input.
	it('reports invalid recipes with the offending paths and exit code 2', async () => {
		const invalid = await run(['--recipe', writeJson('bad.json', { ...recipe, spectral_window_id: -1, title: '' })]);
		expect(invalid.code).toBe(2);
		expect(invalid.out).toBe('');
		expect(invalid.err).toContain('$.spectral_window_id');
		expect(invalid.err).toContain('$.title');
		const notJson = await run(['--recipe', writeJson('broken.json', '{"schema_version": 1,')]);
		expect(notJson.code).toBe(2);
		expect(notJson.err).toMatch(/expected valid JSON/);
		const newer = await run(['--recipe', writeJson('newer.json', { format: 'phasewright.recipe', format_version: 9 })]);
		expect(newer.err).toMatch(/newer than the version this Phasewright reads/);
		const missing = await run(['--recipe', join(work, 'nope.json')]);
		expect(missing.code).toBe(2);
		expect(missing.err).toMatch(/cannot read the recipe file .*nope\.json \(ENOENT\)/);
	});

	it('exits 1 with the template error when the templates cannot render', async () => {
		const broken = mkdtempSync(join(work, 'templates-'));
		mkdirSync(join(broken, 'python'));
		writeFileSync(join(broken, 'python', 'calibrate.py.hbs'), 'X = {{py p.no_such_field}}\n');
		let err = '';
		const code = await runRenderCommand(['--recipe', recipePath], { writeOut: () => undefined, writeErr: (t) => (err += t), templatesDir: broken });
		expect(code).toBe(1);
		expect(err).toMatch(/templates\/python\/calibrate\.py\.hbs line 1.*"p\.no_such_field"/);
	});

	it('runs through the command shape scripts/cli.ts registers', async () => {
		let out = '';
		const io = { readText: (path: string) => readFileSync(path, 'utf8'), out: (t: string) => (out += t), err: () => undefined };
		expect(await renderCommand.run({ recipe: recipePath }, io)).toBe(0);
		expect(out).toBe((await run(['--recipe', recipePath])).out);
	});

	it('exits 2 with the usage on bad arguments', async () => {
		for (const args of [[], ['--recipe'], ['--recip', 'x.json'], ['--recipe', recipePath, '--template', 'standard']]) {
			const result = await run(args);
			expect(result.code, args.join(' ')).toBe(2);
			expect(result.err).toMatch(/^render: /);
		}
	});
});

// Tests of scripts/cli.ts, kept here because the unit project only collects src/**/*.test.ts.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { runCli, type CliIo } from '../../../scripts/cli';
import { createDefaultRecipe } from './defaults';
import { createDemoObservation } from './demo-observation';
import { createRecipeExport } from './recipe';

const demoPath = new URL('../../../tests/fixtures/observations/demo.json', import.meta.url).pathname;

async function run(argv: string[], files: Record<string, string> = {}): Promise<{ code: number; out: string; err: string }> {
	let out = '';
	let err = '';
	const io: CliIo = {
		readText: (path) => {
			const text = files[path] ?? (path === demoPath ? readFileSync(path, 'utf8') : undefined);
			if (text === undefined) throw Object.assign(new Error('missing'), { code: 'ENOENT' });
			return text;
		},
		out: (t) => (out += t),
		err: (t) => (err += t)
	};
	const code = await runCli(argv, io);
	return { code, out, err };
}

describe('cli validate', () => {
	it('prints findings and exits 0 for the demo default recipe', async () => {
		const recipe = JSON.stringify(createDefaultRecipe(createDemoObservation()));
		const r = await run(['validate', '--recipe', 'r.json', '--observation', demoPath], { 'r.json': recipe });
		expect(r.code).toBe(0);
		expect(JSON.parse(r.out)).toMatchObject({ errors: 0, warnings: 0 });
	});

	it('uses the observation embedded in an export and exits 1 on errors', async () => {
		const observation = createDemoObservation();
		const recipe = createDefaultRecipe(observation);
		recipe.reference_antenna.primary = 'CF17';
		const doc = createRecipeExport({ title: 't', observation, recipe, template: { name: 'standard', version: 1 } });
		const r = await run(['validate', '--recipe', 'x.json'], { 'x.json': JSON.stringify(doc) });
		expect(r.code).toBe(1);
		expect(JSON.parse(r.out).findings.map((f: { code: string }) => f.code)).toContain('refant.not_in_calibrator_scans');
	});

	it('applies a policy file', async () => {
		const recipe = createDefaultRecipe(createDemoObservation());
		const prep = recipe.steps.find((s) => s.kind === 'bandpass_prep');
		if (prep && prep.kind === 'bandpass_prep') prep.interval = { mode: 'integration' };
		const files = { 'r.json': JSON.stringify(recipe), 'p.json': JSON.stringify({ overrides: { 'prep.interval_shorter_than_scan': 'warning' } }) };
		const r = await run(['validate', '--recipe', 'r.json', '--observation', demoPath, '--policy', 'p.json'], files);
		expect(r.code).toBe(0);
		expect(JSON.parse(r.out).warnings).toBe(1);
	});

	it('exits 2 with a clear message for a missing file, bad JSON or an invalid recipe', async () => {
		expect((await run(['validate', '--recipe', 'nope.json'])).err).toMatch(/cannot read recipe file "nope\.json" \(ENOENT\)/);
		const bad = await run(['validate', '--recipe', 'b.json'], { 'b.json': '{' });
		expect(bad.code).toBe(2);
		expect(bad.err).toMatch(/is not valid JSON/);
		const invalid = await run(['validate', '--recipe', 'i.json'], { 'i.json': '{"schema_version": 2}' });
		expect(invalid.code).toBe(2);
		expect(invalid.err).toMatch(/\$\.schema_version: expected one of 1, found the integer 2/);
	});
});

describe('cli flux', () => {
	it('gives the standard flux density', async () => {
		// Perley & Butler 2017, via METHODS.md §8: 3C286 = 15.0838 Jy, α = −0.5010 at 1.4 GHz.
		const r = await run(['flux', '--source', 'J1331+3030', '--freq-hz', '1.4e9']);
		expect(r.code).toBe(0);
		const out = JSON.parse(r.out);
		expect(out.standard).toBe('3C286');
		expect(out.flux_jy).toBeCloseTo(15.0838, 4);
		expect(out.spectral_index).toBeCloseTo(-0.501, 4);
	});

	it('rejects an unknown source and a bad frequency with exit 2', async () => {
		expect((await run(['flux', '--source', 'Vega', '--freq-hz', '1e9'])).code).toBe(2);
		const r = await run(['flux', '--source', '3C48', '--freq-hz=-5']);
		expect(r.code).toBe(2);
		expect(r.err).toMatch(/--freq-hz: expected a positive number, found "-5"/);
	});
});

describe('cli interval', () => {
	it('reproduces the worked example', async () => {
		// METHODS.md §9 worked example (Wrobel & Walker 1999): 2 mJy, SNR 10, 1 corr, η 0.88 → 204.97 s → 208 s.
		const r = await run(['interval', '--flux-jy', '0.002', '--sefd-jy', '400', '--bandwidth-hz', '200e6', '--antennas', '64', '--snr', '10', '--efficiency', '0.88', '--correlations', '1', '--integration-s', '8']);
		expect(r.code).toBe(0);
		const out = JSON.parse(r.out);
		expect(out.minimum_s).toBeCloseTo(204.97, 2);
		expect(out.solution_s).toBe(208);
	});

	it('rejects unknown options and missing values with exit 2', async () => {
		expect((await run(['interval', '--flux-jy', '1', '--speed', '3'])).code).toBe(2);
		expect((await run(['interval', '--flux-jy', '1'])).err).toMatch(/missing --sefd-jy/);
		expect((await run(['interval', '--flux-jy', '1', '--sefd-jy', '400', '--bandwidth-hz', '1e6', '--antennas', '2.5', '--snr', '3'])).err).toMatch(/--antennas: expected a whole number/);
	});
});

describe('cli defaults and dispatch', () => {
	it('prints a default recipe for an observation', async () => {
		const r = await run(['defaults', '--observation', demoPath, '--title', 'Night 1']);
		expect(r.code).toBe(0);
		expect(JSON.parse(r.out).title).toBe('Night 1');
	});

	it('rejects an unknown command', async () => {
		const r = await run(['calibrate']);
		expect(r.code).toBe(2);
		expect(r.err).toMatch(/unknown command "calibrate"/);
	});
});

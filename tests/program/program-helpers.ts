/**
 * Test and benchmark helpers: render the starter template set for a recipe, simulate bundles
 * and run python3. Node APIs are fine here (tests only).
 */
import { spawnSync, type SpawnSyncReturns } from 'node:child_process';
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { recipeParamsSchema, type RecipeParams, type RecipeParamsInput } from '../../src/lib/calibration/recipe';
import { buildRenderContext } from '../../src/lib/script/render-context';
import { renderProgram } from '../../src/lib/script/render';

export const REPO_ROOT = resolve(dirname(fileURLToPath(import.meta.url)), '..', '..');
export const TEMPLATE_DIR = join(REPO_ROOT, 'templates');
export const SIMULATOR = join(REPO_ROOT, 'tests', 'program', 'simulate.py');

/** Field names the simulator writes (see simulate.py); the target's name carries quotes on purpose. */
export const SIM_FIELDS = {
	flux: '3C286',
	gain: 'Nursery G1',
	target: "Nursery T1 'north\"",
	gain2: 'Nursery G2'
} as const;

/** The names of the simulator's flux calibrator, gain calibrator and target. */
export type SimFieldNames = { flux: string; gain: string; target: string };

/** Reads the starter template set from disk, keyed by path under templates/. */
export function readTemplateFiles(): Record<string, string> {
	const files: Record<string, string> = {};
	for (const dir of ['python', 'partials']) {
		for (const name of readdirSync(join(TEMPLATE_DIR, dir))) {
			if (name.endsWith('.hbs')) files[`${dir}/${name}`] = readFileSync(join(TEMPLATE_DIR, dir, name), 'utf8');
		}
	}
	return files;
}

/** A recipe for the simulator's fields; `change` edits the parsed input before validation. */
export function createSimRecipe(change?: (r: RecipeParamsInput) => void, names: SimFieldNames = SIM_FIELDS): RecipeParams {
	const fields = names;
	const input: RecipeParamsInput = {
		schema_version: 1,
		title: 'Simulated "Corrie Flats" test \n# not code',
		notes: 'Invented data.\u2028 """ {{x}}',
		spectral_window_id: 0,
		fields: [
			{ name: fields.flux, roles: ['flux_calibrator', 'bandpass_calibrator', 'delay_calibrator'] },
			{ name: fields.gain, roles: ['gain_calibrator'] },
			{ name: fields.target, roles: ['target'] }
		],
		flux_models: [{ field: fields.flux, model: { kind: 'standard', standard: '3C286' } }],
		flux_estimates: [{ field: fields.gain, flux_jy: 2 }],
		targets: [{ field: fields.target, gain_calibrator: fields.gain, interpolation: 'linear' }],
		reference_antenna: { primary: 'A01', fallbacks: ['A03', 'A04'] },
		clean_channels: [{ start: 20, end: 44 }],
		excluded_channels: [{ start: 30, end: 31 }],
		steps: [
			{ kind: 'delay', fields: [fields.flux], interval: { mode: 'scan' }, min_snr: 5, search_window_ns: 50 },
			{ kind: 'bandpass_prep', fields: [fields.flux], interval: { mode: 'scan' }, solve_for: 'phase', min_snr: 3 },
			{ kind: 'bandpass', fields: [fields.flux], interval: { mode: 'scan' }, min_snr: 3 },
			{ kind: 'gain', fields: [fields.flux, fields.gain], interval: { mode: 'integration' }, solve_for: 'amplitude_and_phase', min_snr: 5 },
			{ kind: 'flux_bootstrap', fields: [fields.gain] },
			{ kind: 'apply', fields: [fields.flux, fields.gain, fields.target] },
			{ kind: 'verify', fields: [fields.flux, fields.gain], max_amplitude_scatter_pct: 5, max_phase_rms_deg: 5 }
		]
	};
	change?.(input);
	return recipeParamsSchema.parse(input);
}

/** Renders the starter template set for a recipe (the same path the app takes). */
export function renderRecipe(recipe: RecipeParams): string {
	const context = buildRenderContext({
		recipe,
		observation: null,
		recipeId: '00000000-0000-4000-8000-000000000001',
		recipeVersion: 3,
		templateName: 'standard',
		templateVersion: 1
	});
	return renderProgram(readTemplateFiles(), context);
}

/** Renders and writes the program to `dir/calibrate.py`; returns its path. */
export function writeProgram(dir: string, recipe: RecipeParams): string {
	mkdirSync(dir, { recursive: true });
	const path = join(dir, 'calibrate.py');
	writeFileSync(path, renderRecipe(recipe), 'utf8');
	return path;
}

/** Runs python3 with arguments; never throws on a non-zero exit. */
export function runPython(args: string[], cwd?: string): SpawnSyncReturns<string> {
	const run = spawnSync('python3', args, { encoding: 'utf8', cwd, maxBuffer: 512 * 1024 * 1024 });
	if (run.error) throw new Error(`python3 could not be started: ${run.error.message}`);
	return run;
}

/** Simulates a bundle with the given simulator options; returns the truth JSON. */
export function simulateBundle(bundle: string, truth: string, options: string[]): unknown {
	const run = runPython([SIMULATOR, 'bundle', '--out', bundle, '--truth', truth, ...options]);
	if (run.status !== 0) throw new Error(`simulate.py failed (${String(run.status)}):\n${run.stderr}`);
	return JSON.parse(readFileSync(truth, 'utf8')) as unknown;
}

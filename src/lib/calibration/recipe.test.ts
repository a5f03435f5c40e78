import { describe, expect, it } from 'vitest';
import { createDefaultRecipe } from './defaults';
import { createDemoObservation } from './demo-observation';
import { createRecipeExport, parseRecipeExport, parseRecipeParamsValue, recipeParamsSchema, STEP_ORDER } from './recipe';

function createExport() {
	const observation = createDemoObservation();
	const recipe = createDefaultRecipe(observation);
	return createRecipeExport({ title: recipe.title, observation, recipe, template: { name: 'standard', version: 1 } });
}

describe('recipe schema', () => {
	it('lists the seven step kinds in the required order', () => {
		// DESIGN.md "Steps" (order of operations, METHODS.md §13).
		expect(STEP_ORDER).toEqual(['delay', 'bandpass_prep', 'bandpass', 'gain', 'flux_bootstrap', 'apply', 'verify']);
	});

	it('fills defaults for notes and manual-model curvature', () => {
		const recipe = createDefaultRecipe(createDemoObservation());
		const input: Record<string, unknown> = { ...recipe, flux_models: [{ field: 'X', model: { kind: 'manual', flux_jy: 1, ref_freq_hz: 1e9, spectral_index: -0.7 } }] };
		delete input.notes;
		const parsed = recipeParamsSchema.parse(input);
		expect(parsed.notes).toBe('');
		expect(parsed.flux_models[0]?.model).toMatchObject({ curvature: 0 });
	});

	it('keeps arbitrary user text in names, titles and notes', () => {
		const recipe = createDefaultRecipe(createDemoObservation(), { title: 'Tom\'s "run"\n\u0000 ✓' });
		recipe.notes = 'line 1\r\nline 2 \u2028 """ \\';
		const result = parseRecipeParamsValue(recipe);
		expect(result.ok).toBe(true);
		if (result.ok) expect(result.value.title).toBe('Tom\'s "run"\n\u0000 ✓');
	});

	it('reports unknown keys, bad discriminators and bad numbers with paths', () => {
		const recipe = createDefaultRecipe(createDemoObservation()) as unknown as Record<string, unknown>;
		const steps = recipe.steps as Record<string, unknown>[];
		steps[1] = { ...steps[1], interval: { mode: 'every_scan' } };
		steps[2] = { ...steps[2], min_snr: -1 };
		recipe.refant = 'CF01';
		const result = parseRecipeParamsValue(recipe);
		expect(result.ok).toBe(false);
		if (!result.ok) {
			expect(result.error.issues).toContainEqual({ path: '$.steps[1].interval.mode', message: 'expected "mode" to be one of "integration", "scan", "seconds", "observation", found the text "every_scan"' });
			expect(result.error.issues).toContainEqual({ path: '$.steps[2].min_snr', message: 'expected a value more than 0, found the integer -1' });
			expect(result.error.issues).toContainEqual({ path: '$', message: 'unknown key "refant": remove or rename it' });
		}
	});
});

describe('parseRecipeExport', () => {
	it('round-trips an export', () => {
		const doc = createExport();
		const result = parseRecipeExport(JSON.stringify(doc));
		expect(result.ok).toBe(true);
		if (result.ok) expect(result.value).toEqual(doc);
	});

	it('rejects another format and a newer version with one clear message', () => {
		const other = parseRecipeExport(JSON.stringify({ ...createExport(), format: 'phasewright.observation' }));
		expect(other.ok).toBe(false);
		if (!other.ok) expect(other.error.issues).toEqual([{ path: '$.format', message: 'expected "phasewright.recipe", found the text "phasewright.observation": this file is not a Phasewright recipe file' }]);
		const newer = parseRecipeExport(JSON.stringify({ ...createExport(), format_version: 3 }));
		expect(newer.ok).toBe(false);
		if (!newer.ok) expect(newer.error.issues[0]?.message).toMatch(/version 3, newer than the version this Phasewright reads \(1\)/);
	});

	it('applies the observation cross-checks to the embedded observation', () => {
		const doc = createExport();
		const scan = doc.observation.scans[0];
		if (scan) scan.field_id = 42;
		const result = parseRecipeExport(JSON.stringify(doc));
		expect(result.ok).toBe(false);
		if (!result.ok) expect(result.error.issues[0]?.path).toBe('$.observation.scans[0].field_id');
	});

	it('reports unreadable JSON without throwing', () => {
		const result = parseRecipeExport('{"format": "phasewright.recipe",');
		expect(result.ok).toBe(false);
		if (!result.ok) expect(result.error.issues[0]?.message).toMatch(/expected valid JSON/);
	});
});

describe('user text in recipes', () => {
	it('rejects a title with an unpaired UTF-16 surrogate (it cannot be written as UTF-8)', () => {
		const recipe = createDefaultRecipe(createDemoObservation());
		const bad = { ...recipe, title: 'south\ud800' };
		const r = recipeParamsSchema.safeParse(bad);
		expect(r.success).toBe(false);
		expect(recipeParamsSchema.safeParse({ ...recipe, title: 'emoji 🌌 ok' }).success).toBe(true);
	});
});

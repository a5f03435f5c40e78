import { describe, expect, it } from 'vitest';
import { createCentralChannels, createDefaultRecipe, DEFAULT_MIN_SNR } from './defaults';
import { createDemoObservation } from './demo-observation';
import { recipeParamsSchema } from './recipe';
import { suggestRoles } from './suggest-roles';
import { hasErrors, validate } from './validate';

function createDemoWithoutIntents() {
	const obs = createDemoObservation();
	for (const f of obs.fields) delete f.intents;
	return obs;
}

describe('suggestRoles', () => {
	it('uses the intents when the observation records them', () => {
		const s = suggestRoles(createDemoObservation());
		expect(s.fields.map((f) => [f.name, f.roles])).toEqual([
			['3C286', ['flux_calibrator', 'bandpass_calibrator', 'delay_calibrator']],
			['CFA-GCAL-1', ['gain_calibrator']],
			['Nursery-North', ['target']],
			['Nursery-South', ['target']]
		]);
		expect(s.fields[0]?.standard).toBe('3C286');
	});

	it('without intents, recognises the flux standard and tells the gain calibrator from the targets by its short scans', () => {
		const s = suggestRoles(createDemoWithoutIntents());
		expect(s.fields.map((f) => f.roles)).toEqual([
			['flux_calibrator', 'bandpass_calibrator', 'delay_calibrator'],
			['gain_calibrator'],
			['target'],
			['target']
		]);
		expect(s.fields[0]?.reason).toMatch(/flux standard 3C286/);
		expect(s.targets.map((t) => [t.field, t.gain_calibrator])).toEqual([
			['Nursery-North', 'CFA-GCAL-1'],
			['Nursery-South', 'CFA-GCAL-1']
		]);
	});

	it('recognises a flux standard by position when the field has an observatory name', () => {
		const obs = createDemoWithoutIntents();
		const f = obs.fields[0];
		if (f) f.name = 'FLUXCAL_A';
		const s = suggestRoles(obs);
		expect(s.fields[0]?.standard).toBe('3C286');
		expect(s.fields[0]?.reason).toMatch(/arcsec from the flux standard 3C286/);
	});

	it('picks the nearest of several short-scan fields for each target', () => {
		const obs = createDemoWithoutIntents();
		// A second short-scan field next to Nursery-South, observed in 2-min scans like the first.
		obs.fields.push({ id: 4, name: 'CFA-GCAL-2', ra_deg: 209.0, dec_deg: 19.0 });
		for (const scan of obs.scans.filter((s) => s.field_id === 1).slice(0, 4)) scan.field_id = 4;
		const s = suggestRoles(obs);
		expect(s.targets.map((t) => [t.field, t.gain_calibrator])).toEqual([
			['Nursery-North', 'CFA-GCAL-1'],
			['Nursery-South', 'CFA-GCAL-2']
		]);
	});
});

describe('createDefaultRecipe', () => {
	it('produces a recipe that passes its own schema and validates without errors', () => {
		for (const obs of [createDemoObservation(), createDemoWithoutIntents()]) {
			const recipe = createDefaultRecipe(obs, { title: 'Demo' });
			expect(recipeParamsSchema.safeParse(recipe).success).toBe(true);
			expect(hasErrors(validate(recipe, obs))).toBe(false);
		}
	});

	it('uses the METHODS.md §9 thresholds and §12 verify limits', () => {
		// Thresholds (common practice, METHODS.md §9): phase-only 3, complex 5, bandpass (amplitude-critical) 10, delay 5.
		// Verify limits 5 % / 5° (common practice; METHODS.md §12).
		const recipe = createDefaultRecipe(createDemoObservation());
		const byKind = new Map(recipe.steps.map((s) => [s.kind, s]));
		expect(byKind.get('bandpass_prep')).toMatchObject({ min_snr: 3, interval: { mode: 'scan' } });
		expect(byKind.get('gain')).toMatchObject({ min_snr: 5, solve_for: 'amplitude_and_phase' });
		expect(byKind.get('bandpass')).toMatchObject({ min_snr: 10 });
		expect(byKind.get('delay')).toMatchObject({ min_snr: 5 });
		expect(byKind.get('verify')).toMatchObject({ max_amplitude_scatter_pct: 5, max_phase_rms_deg: 5 });
		expect(DEFAULT_MIN_SNR.gain_phase).toBe(3);
	});

	it('chooses an unflagged reference antenna with three distinct fallbacks', () => {
		const obs = createDemoObservation();
		const { reference_antenna: ref } = createDefaultRecipe(obs);
		const all = [ref.primary, ...ref.fallbacks];
		expect(ref.fallbacks).toHaveLength(3);
		expect(new Set(all).size).toBe(4);
		expect(all).not.toContain('CF17');
	});

	it('models the flux standard and scales the gain calibrator from it', () => {
		const recipe = createDefaultRecipe(createDemoObservation());
		expect(recipe.flux_models).toEqual([{ field: '3C286', model: { kind: 'standard', standard: '3C286' } }]);
		expect(recipe.steps.find((s) => s.kind === 'flux_bootstrap')?.fields).toEqual(['CFA-GCAL-1']);
		expect(recipe.steps.find((s) => s.kind === 'apply')?.fields).toEqual(['3C286', 'CFA-GCAL-1', 'Nursery-North', 'Nursery-South']);
	});
});

describe('createCentralChannels', () => {
	it('takes the central ~10 % of the band', () => {
		// A few to ~10 % of the band near centre (common practice, METHODS.md §5).
		expect(createCentralChannels(1024)).toEqual([{ start: 461, end: 562 }]);
		expect(createCentralChannels(64)).toEqual([{ start: 29, end: 34 }]);
		expect(createCentralChannels(1)).toEqual([{ start: 0, end: 0 }]);
	});
});

import { describe, expect, it } from 'vitest';
import { recipeParamsSchema, type RecipeParams } from '../calibration/recipe';
import { canonicalJson } from './canonical-json';
import { buildRenderContext, type RenderContextInput, type RenderLogPolynomialModel } from './render-context';
import { paramsSha256 } from './sha256';

function makeFullRecipe(): RecipeParams {
	return recipeParamsSchema.parse({
		schema_version: 1,
		title: 'Corrie Flats L-band',
		notes: 'invented demo',
		spectral_window_id: 0,
		fields: [
			{ name: '3C286', roles: ['flux_calibrator', 'bandpass_calibrator', 'delay_calibrator'] },
			{ name: 'PKS B1934-638', roles: ['flux_calibrator'] },
			{ name: 'GCAL', roles: ['gain_calibrator'] },
			{ name: 'T1', roles: ['target'] }
		],
		flux_models: [
			{ field: '3C286', model: { kind: 'standard', standard: '3C286' } },
			{ field: 'PKS B1934-638', model: { kind: 'standard', standard: 'PKS B1934-638' } },
			{ field: 'GCAL', model: { kind: 'manual', flux_jy: 2.345, ref_freq_hz: 1.25e9, spectral_index: -0.7 } }
		],
		flux_estimates: [{ field: 'GCAL', flux_jy: 2.3 }],
		targets: [{ field: 'T1', gain_calibrator: 'GCAL', interpolation: 'linear' }],
		reference_antenna: { primary: 'A05', fallbacks: ['A07', 'A01'] },
		clean_channels: [{ start: 480, end: 540 }],
		excluded_channels: [{ start: 100, end: 120 }, { start: 700, end: 701 }],
		steps: [
			{ kind: 'delay', fields: ['3C286'], interval: { mode: 'scan' }, min_snr: 5, search_window_ns: 250 },
			{ kind: 'bandpass_prep', fields: ['3C286'], interval: { mode: 'seconds', seconds: 30 }, solve_for: 'phase', min_snr: 3 },
			{ kind: 'bandpass', fields: ['3C286'], interval: { mode: 'observation' }, min_snr: 10 },
			{ kind: 'gain', fields: ['3C286', 'GCAL'], interval: { mode: 'integration' }, solve_for: 'amplitude_and_phase', min_snr: 5 },
			{ kind: 'flux_bootstrap', fields: ['GCAL'] },
			{ kind: 'apply', fields: ['T1', 'GCAL'] },
			{ kind: 'verify', fields: ['GCAL'], max_amplitude_scatter_pct: 5, max_phase_rms_deg: 3 }
		]
	});
}

function makeInput(recipe: RecipeParams): RenderContextInput {
	return { recipe, observation: null, recipeId: 'r-1', recipeVersion: 4, templateName: 'standard', templateVersion: 2 };
}

describe('buildRenderContext', () => {
	it('fills the header with the ids, template identity and the parameters digest', () => {
		const recipe = makeFullRecipe();
		const { header } = buildRenderContext(makeInput(recipe));
		expect(header).toEqual({
			title: 'Corrie Flats L-band', recipe_id: 'r-1', recipe_version: 4, template_name: 'standard', template_version: 2,
			params_sha256: paramsSha256(recipe)
		});
		expect(header.params_sha256).toMatch(/^[0-9a-f]{64}$/);
	});

	it('maps each step with its fields, interval, thresholds and solve mode', () => {
		const { p } = buildRenderContext(makeInput(makeFullRecipe()));
		expect(p.steps).toEqual(['delay', 'bandpass_prep', 'bandpass', 'gain', 'flux_bootstrap', 'apply', 'verify']);
		expect(p.delay).toEqual({ fields: ['3C286'], interval: { mode: 'scan', seconds: null }, min_snr: 5, search_window_ns: 250 });
		expect(p.bandpass_prep).toEqual({ fields: ['3C286'], interval: { mode: 'seconds', seconds: 30 }, min_snr: 3 });
		expect(p.bandpass).toEqual({ fields: ['3C286'], interval: { mode: 'observation', seconds: null }, min_snr: 10 });
		expect(p.gain).toEqual({ fields: ['3C286', 'GCAL'], interval: { mode: 'integration', seconds: null }, solve_for: 'amplitude_and_phase', min_snr: 5 });
		expect(p.flux_bootstrap).toEqual({ fields: ['GCAL'] });
		expect(p.apply).toEqual({ fields: ['T1', 'GCAL'] });
		expect(p.verify).toEqual({ fields: ['GCAL'], max_amplitude_scatter_pct: 5, max_phase_rms_deg: 3 });
	});

	it('maps the field roles, targets, reference antenna and channel ranges', () => {
		const { p } = buildRenderContext(makeInput(makeFullRecipe()));
		expect(p.title).toBe('Corrie Flats L-band');
		expect(p.notes).toBe('invented demo');
		expect(p.field_roles).toEqual({
			'3C286': ['flux_calibrator', 'bandpass_calibrator', 'delay_calibrator'], 'PKS B1934-638': ['flux_calibrator'], GCAL: ['gain_calibrator'], T1: ['target']
		});
		expect(p.targets).toEqual([{ field: 'T1', gain_calibrator: 'GCAL', interpolation: 'linear' }]);
		expect(p.reference_antenna).toBe('A05');
		expect(p.reference_fallbacks).toEqual(['A07', 'A01']);
		expect(p.clean_channels).toEqual([[480, 540]]);
		expect(p.excluded_channels).toEqual([[100, 120], [700, 701]]);
	});

	it('makes absent steps null', () => {
		const recipe = { ...makeFullRecipe(), steps: makeFullRecipe().steps.filter((s) => s.kind === 'gain' || s.kind === 'apply') };
		const { p } = buildRenderContext(makeInput(recipe));
		expect(p.steps).toEqual(['gain', 'apply']);
		expect([p.delay, p.bandpass_prep, p.bandpass, p.flux_bootstrap, p.verify]).toEqual([null, null, null, null, null]);
		expect(p.gain).not.toBeNull();
	});

	it('resolves standard flux models to the published polynomials', () => {
		const { p } = buildRenderContext(makeInput(makeFullRecipe()));
		// Perley & Butler 2017 coefficients and 0.05–50 GHz range for 3C286, via METHODS.md §8.
		expect(p.flux_models['3C286']).toMatchObject({
			kind: 'log_polynomial', coefficients: [1.2481, -0.4507, -0.1798, 0.0357], freq_unit_hz: 1e9, valid_min_hz: 0.05e9, valid_max_hz: 50e9
		});
		expect(p.flux_models['3C286']).toHaveProperty('citation', expect.stringMatching(/Perley & Butler 2017/));
		// Reynolds 1994 (ATNF memo AT/39.3/040) with ν in MHz, valid 408–8640 MHz, via METHODS.md §8.
		expect(p.flux_models['PKS B1934-638']).toMatchObject({
			kind: 'log_polynomial', coefficients: [-30.7667, 26.4908, -7.0977, 0.605334], freq_unit_hz: 1e6, valid_min_hz: 408e6, valid_max_hz: 8640e6
		});
	});

	it('gives models that evaluate to the published flux densities', () => {
		const { p } = buildRenderContext(makeInput(makeFullRecipe()));
		const evaluate = (model: RenderLogPolynomialModel, hz: number): number => {
			const x = Math.log10(hz / model.freq_unit_hz);
			return 10 ** model.coefficients.reduce((sum, c, i) => sum + c * x ** i, 0);
		};
		// S(1.4 GHz): 3C286 15.0838 Jy (Perley & Butler 2017), PKS B1934-638 14.9077 Jy (Reynolds 1994), via METHODS.md §8.
		expect(evaluate(p.flux_models['3C286'] as RenderLogPolynomialModel, 1.4e9)).toBeCloseTo(15.0838, 3);
		expect(evaluate(p.flux_models['PKS B1934-638'] as RenderLogPolynomialModel, 1.4e9)).toBeCloseTo(14.9077, 3);
	});

	it('passes manual models through as power laws, curvature defaulting to 0', () => {
		const { p } = buildRenderContext(makeInput(makeFullRecipe()));
		expect(p.flux_models.GCAL).toEqual({ kind: 'power_law', flux_jy: 2.345, ref_freq_hz: 1.25e9, spectral_index: -0.7, curvature: 0 });
	});

	it('keeps a field literally called "__proto__" as an ordinary key', () => {
		const recipe = { ...makeFullRecipe(), fields: [{ name: '__proto__', roles: ['target' as const] }] };
		const { p } = buildRenderContext(makeInput(recipe));
		expect(Object.keys(p.field_roles)).toEqual(['__proto__']);
		expect(Object.getPrototypeOf(p.field_roles)).toBe(Object.prototype);
	});

	it('is deterministic and shares no arrays with the recipe', () => {
		const recipe = makeFullRecipe();
		const first = buildRenderContext(makeInput(recipe));
		expect(canonicalJson(buildRenderContext(makeInput(makeFullRecipe())))).toBe(canonicalJson(first));
		first.p.reference_fallbacks.push('A99');
		first.p.delay?.fields.push('X');
		expect(recipe.reference_antenna.fallbacks).toEqual(['A07', 'A01']);
		expect(recipe.steps[0]?.fields).toEqual(['3C286']);
	});
});

import { describe, expect, it } from 'vitest';
import type { RecipeParams, Step, StepKind } from '../../calibration/recipe';
import { diffParams, type ParamChange } from './param-diff';

// Invented demo recipe (field and antenna names are made up). Expected labels follow the
// wording the workflow brief gives for the diff view (it is the product's own wording);
// trade facts are cited where they appear.
function createRecipe(): RecipeParams {
	return {
		schema_version: 1,
		title: 'Corrie Flats L-band',
		notes: '',
		spectral_window_id: 0,
		fields: [
			{ name: '3C286', roles: ['flux_calibrator', 'bandpass_calibrator', 'delay_calibrator'] },
			{ name: 'J1331', roles: ['flux_calibrator'] },
			{ name: 'CF-GCAL', roles: ['gain_calibrator'] },
			{ name: 'CF-T1', roles: ['target'] }
		],
		flux_models: [{ field: '3C286', model: { kind: 'standard', standard: '3C286' } }],
		flux_estimates: [{ field: 'CF-GCAL', flux_jy: 2.5 }],
		targets: [{ field: 'CF-T1', gain_calibrator: 'CF-GCAL', interpolation: 'linear' }],
		reference_antenna: { primary: 'A07', fallbacks: ['A03', 'A05'] },
		clean_channels: [{ start: 100, end: 400 }],
		excluded_channels: [],
		steps: [
			{ kind: 'bandpass_prep', fields: ['3C286'], interval: { mode: 'scan' }, solve_for: 'phase', min_snr: 3 },
			{ kind: 'bandpass', fields: ['3C286'], interval: { mode: 'scan' }, min_snr: 10 },
			{ kind: 'gain', fields: ['3C286', 'CF-GCAL'], interval: { mode: 'seconds', seconds: 60 }, solve_for: 'amplitude_and_phase', min_snr: 5 },
			{ kind: 'flux_bootstrap', fields: ['CF-GCAL'] },
			{ kind: 'apply', fields: ['3C286', 'CF-GCAL', 'CF-T1'] },
			{ kind: 'verify', fields: ['3C286', 'CF-GCAL'], max_amplitude_scatter_pct: 5, max_phase_rms_deg: 5 }
		]
	};
}

function stepOf<K extends StepKind>(recipe: RecipeParams, kind: K): Extract<Step, { kind: K }> {
	const step = recipe.steps.find((s): s is Extract<Step, { kind: K }> => s.kind === kind);
	if (!step) throw new Error(`fixture has no ${kind} step`);
	return step;
}

function labelsAfter(change: (r: RecipeParams) => void): string[] {
	const a = createRecipe();
	const b = createRecipe();
	change(b);
	return diffParams(a, b).map((c) => c.label);
}

describe('diffParams', () => {
	it('finds nothing between identical recipes', () => {
		expect(diffParams(createRecipe(), createRecipe())).toEqual([]);
	});

	it('describes a changed gain solve interval in seconds', () => {
		const a = createRecipe();
		const b = createRecipe();
		stepOf(b, 'gain').interval = { mode: 'seconds', seconds: 30 };
		expect(diffParams(a, b)).toEqual<ParamChange[]>([
			{ path: 'steps[2].interval', label: 'Gain solve interval: 60 s \u2192 30 s', before: '60 s', after: '30 s', kind: 'changed' }
		]);
	});

	it('names each interval mode in plain words', () => {
		expect(labelsAfter((r) => (stepOf(r, 'gain').interval = { mode: 'integration' }))).toEqual(['Gain solve interval: 60 s \u2192 per integration']);
		expect(labelsAfter((r) => (stepOf(r, 'bandpass').interval = { mode: 'observation' }))).toEqual(['Bandpass solve interval: per scan \u2192 whole observation']);
	});

	it('describes the reference antenna and its ordered fallbacks', () => {
		expect(
			labelsAfter((r) => {
				r.reference_antenna = { primary: 'A12', fallbacks: ['A05'] };
			})
		).toEqual(['Reference antenna: A07 \u2192 A12', 'Fallback reference antennas: A03, A05 \u2192 A05']);
	});

	it('treats a reordering of fallbacks as a change, since their order is the order of use', () => {
		// DESIGN.md "Reference antenna": an ordered fallback list.
		expect(labelsAfter((r) => (r.reference_antenna.fallbacks = ['A05', 'A03']))).toEqual(['Fallback reference antennas: A03, A05 \u2192 A05, A03']);
	});

	it('describes clean channel ranges with an en dash', () => {
		expect(labelsAfter((r) => (r.clean_channels = [{ start: 120, end: 400 }]))).toEqual(['Clean channels: 100\u2013400 \u2192 120\u2013400']);
	});

	it('marks excluded channels appearing for the first time as added', () => {
		const a = createRecipe();
		const b = createRecipe();
		b.excluded_channels = [{ start: 700, end: 720 }, { start: 512, end: 512 }];
		expect(diffParams(a, b)).toEqual([
			{ path: 'excluded_channels', label: 'Excluded channels: none \u2192 512, 700\u2013720', before: null, after: '512, 700\u2013720', kind: 'added' }
		]);
	});

	it('summarises long interference lists by the ranges that came and went', () => {
		const a = createRecipe();
		const b = createRecipe();
		a.excluded_channels = Array.from({ length: 40 }, (_, i) => ({ start: 10 * i, end: 10 * i + 2 }));
		b.excluded_channels = [...a.excluded_channels.slice(1), { start: 900, end: 905 }];
		const [change] = diffParams(a, b);
		expect(change?.label).toBe('Excluded channels: added 900\u2013905; removed 0\u20132');
		expect(change?.after?.endsWith('900\u2013905')).toBe(true);
	});

	it('describes a flux model changed from a standard to a manual model', () => {
		// 3C286's standard is Perley & Butler 2017 (via METHODS.md §8).
		expect(
			labelsAfter((r) => {
				r.flux_models = [{ field: '3C286', model: { kind: 'manual', flux_jy: 15, ref_freq_hz: 1.4e9, spectral_index: -0.5, curvature: 0 } }];
			})
		).toEqual(['Flux model of 3C286: Perley & Butler 2017 standard \u2192 manual 15.0 Jy at 1.4 GHz, \u03b1 \u22120.5']);
	});

	it('names the standard source when a field uses another name for it', () => {
		// PKS B1934-638's standard is Reynolds 1994 (via METHODS.md §8).
		expect(labelsAfter((r) => r.flux_models.push({ field: 'J1939-6342', model: { kind: 'standard', standard: 'PKS B1934-638' } }))).toEqual([
			'Flux model of J1939-6342: none \u2192 Reynolds 1994 standard of PKS B1934-638'
		]);
	});

	it('describes a field that gains a role, ignoring the order roles are listed in', () => {
		expect(labelsAfter((r) => (r.fields[1] = { name: 'J1331', roles: ['flux_calibrator', 'bandpass_calibrator'] }))).toEqual([
			'Field roles of J1331: flux calibrator \u2192 flux calibrator, bandpass calibrator'
		]);
		expect(labelsAfter((r) => (r.fields[0] = { name: '3C286', roles: ['delay_calibrator', 'bandpass_calibrator', 'flux_calibrator'] }))).toEqual([]);
	});

	it('reports added and removed fields and targets with their roles', () => {
		const labels = labelsAfter((r) => {
			r.fields = r.fields.filter((f) => f.name !== 'J1331');
			r.fields.push({ name: 'CF-T2', roles: ['target'] });
			r.targets.push({ field: 'CF-T2', gain_calibrator: 'CF-GCAL', interpolation: 'nearest' });
		});
		expect(labels).toEqual([
			'Field added: CF-T2 (target)',
			'Field removed: J1331 (flux calibrator)',
			'Target added: CF-T2 (gain calibrator CF-GCAL, nearest interpolation)'
		]);
	});

	it("describes a target's gain calibrator and interpolation", () => {
		expect(labelsAfter((r) => (r.targets[0] = { field: 'CF-T1', gain_calibrator: '3C286', interpolation: 'nearest' }))).toEqual([
			'Gain calibrator of CF-T1: CF-GCAL \u2192 3C286',
			'Interpolation for CF-T1: linear \u2192 nearest'
		]);
	});

	it('describes a step added, matched by kind wherever it sits', () => {
		const a = createRecipe();
		const b = createRecipe();
		b.steps.unshift({ kind: 'delay', fields: ['3C286'], interval: { mode: 'scan' }, min_snr: 5, search_window_ns: 50 });
		// The other steps moved one place down but did not change.
		expect(diffParams(a, b)).toEqual([{ path: 'steps[0]', label: 'Step added: delay', before: null, after: 'delay', kind: 'added' }]);
		expect(diffParams(b, a).map((c) => [c.label, c.kind])).toEqual([['Step removed: delay', 'removed']]);
	});

	it('describes minimum SNR, solve-for, delay search window and verify limits', () => {
		const a = createRecipe();
		a.steps.unshift({ kind: 'delay', fields: ['3C286'], interval: { mode: 'scan' }, min_snr: 5, search_window_ns: 50 });
		const b = structuredClone(a);
		stepOf(b, 'gain').min_snr = 3;
		stepOf(b, 'gain').solve_for = 'phase';
		stepOf(b, 'delay').search_window_ns = 30;
		stepOf(b, 'verify').max_amplitude_scatter_pct = 3;
		stepOf(b, 'verify').max_phase_rms_deg = 2.5;
		expect(diffParams(a, b).map((c) => c.label)).toEqual([
			'Delay solve search window: \u00b150 ns \u2192 \u00b130 ns',
			'Gain solve solves for: amplitude and phase \u2192 phase',
			'Gain solve minimum SNR: 5 \u2192 3',
			'Verify amplitude scatter limit: 5 % \u2192 3 %',
			'Verify phase rms limit: 5\u00b0 \u2192 2.5\u00b0'
		]);
	});

	it('describes the fields a step uses, ignoring their order', () => {
		expect(labelsAfter((r) => (stepOf(r, 'apply').fields = ['CF-T1', '3C286']))).toEqual(['Apply to fields: 3C286, CF-GCAL, CF-T1 \u2192 CF-T1, 3C286']);
		expect(labelsAfter((r) => (stepOf(r, 'apply').fields = ['CF-T1', 'CF-GCAL', '3C286']))).toEqual([]);
	});

	it('reports a change of step order once, since steps are matched by kind', () => {
		const labels = labelsAfter((r) => {
			const [prep, bandpass, ...rest] = r.steps;
			if (!prep || !bandpass) throw new Error('fixture');
			r.steps = [bandpass, prep, ...rest];
		});
		expect(labels).toEqual([
			'Step order: provisional phase solve, bandpass, gain, flux bootstrap, apply, verify \u2192 bandpass, provisional phase solve, gain, flux bootstrap, apply, verify'
		]);
	});

	it('describes title, notes, flux estimates and spectral window', () => {
		const a = createRecipe();
		const b = createRecipe();
		b.title = 'Corrie Flats L-band, second pass';
		b.notes = 'Antenna A09 was stowed\nfor wind.';
		b.flux_estimates = [{ field: 'CF-GCAL', flux_jy: 2.75 }];
		b.spectral_window_id = 1;
		const changes = diffParams(a, b);
		expect(changes.map((c) => c.label)).toEqual([
			'Title: \u201cCorrie Flats L-band\u201d \u2192 \u201cCorrie Flats L-band, second pass\u201d',
			'Notes: none \u2192 \u201cAntenna A09 was stowed for wind.\u201d',
			'Spectral window: 0 \u2192 1',
			'Flux estimate of CF-GCAL: 2.5 Jy \u2192 2.75 Jy'
		]);
		// The full texts travel in before/after for the view to show.
		expect(changes[1]).toMatchObject({ kind: 'added', before: null, after: 'Antenna A09 was stowed\nfor wind.' });
	});

	it('describes a reason for solving the bandpass without delays as user text', () => {
		const labels = labelsAfter((r) => (stepOf(r, 'bandpass').without_delay_reason = 'Delays were removed at the correlator.'));
		expect(labels).toEqual(['Bandpass solve reason for solving without delays: none \u2192 \u201cDelays were removed at the correlator.\u201d']);
	});

	it('points paths at the newer version, and at the older one for removals', () => {
		const a = createRecipe();
		const b = createRecipe();
		b.flux_models = [];
		stepOf(b, 'verify').max_phase_rms_deg = 4;
		const changes = diffParams(a, b);
		expect(changes.map((c) => [c.path, c.kind])).toEqual([
			['flux_models[0]', 'removed'],
			['steps[5].max_phase_rms_deg', 'changed']
		]);
	});
});

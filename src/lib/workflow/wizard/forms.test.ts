import { describe, expect, it } from 'vitest';
import { createDefaultRecipe } from '$lib/calibration/defaults';
import { createDemoObservation } from '$lib/calibration/demo-observation';
import { validate } from '$lib/calibration/validate';
import {
	applyChannelsForm,
	applyFluxForm,
	applyReferenceForm,
	applyRolesForm,
	applySolveForm,
	channelsFormValues,
	fluxFormValues,
	referenceFormValues,
	rolesFormValues,
	solveFormValues
} from './forms';
import { nextStep, previousStep, stepForPath, WIZARD_STEPS } from './steps';

const obs = createDemoObservation();
const draft = createDefaultRecipe(obs);
const nChan = obs.spectral_windows[0]?.n_chan ?? 0;

function ok<T extends { ok: boolean }>(r: T): Extract<T, { ok: true }> {
	if (!r.ok) throw new Error(`expected success, got ${JSON.stringify(r)}`);
	return r as Extract<T, { ok: true }>;
}

describe('wizard forms round-trip the default recipe unchanged', () => {
	it('roles', () => expect(ok(applyRolesForm(draft, obs, rolesFormValues(draft, obs))).draft).toEqual(draft));
	it('flux', () => expect(ok(applyFluxForm(draft, fluxFormValues(draft))).draft).toEqual(draft));
	it('reference', () => expect(ok(applyReferenceForm(draft, referenceFormValues(draft))).draft).toEqual(draft));
	it('channels', () => expect(ok(applyChannelsForm(draft, nChan, channelsFormValues(draft))).draft).toEqual(draft));
	it('solve', () => expect(ok(applySolveForm(draft, solveFormValues(draft))).draft).toEqual(draft));
});

describe('roles screen', () => {
	it('makes a field a target and gives it the nearest gain calibrator, updating the steps', () => {
		const values = rolesFormValues(draft, obs);
		// Drop the second target's role and give it back: it must find its gain calibrator again.
		const south = obs.fields.findIndex((f) => f.name === 'Nursery-South');
		const without = { ...values, assignments: values.assignments.filter((a) => a !== `${south}:target`), target_gcal: [] };
		const dropped = ok(applyRolesForm(draft, obs, without)).draft;
		expect(dropped.targets.map((t) => t.field)).not.toContain('Nursery-South');
		expect(dropped.steps.find((s) => s.kind === 'apply')?.fields).not.toContain('Nursery-South');
		const back = ok(applyRolesForm(dropped, obs, { ...without, assignments: [...without.assignments, `${south}:target`] })).draft;
		expect(back.targets.find((t) => t.field === 'Nursery-South')?.gain_calibrator).toBe('CFA-GCAL-1');
	});
	it('rejects an unknown role', () => {
		const r = applyRolesForm(draft, obs, { assignments: ['0:sky_model'], target_gcal: [], target_interp: [] });
		expect(r.ok ? '' : r.issues[0]?.message).toMatch(/Unknown field or role/);
	});
});

describe('flux screen', () => {
	it('takes a manual model with the reference frequency in MHz', () => {
		const v = fluxFormValues(draft);
		const r = ok(applyFluxForm(draft, { ...v, model_kind: ['manual'], model_flux_jy: ['15.0'], model_ref_freq_mhz: ['1400'], model_alpha: ['-0.5'], model_curvature: [''] })).draft;
		expect(r.flux_models[0]?.model).toEqual({ kind: 'manual', flux_jy: 15, ref_freq_hz: 1.4e9, spectral_index: -0.5, curvature: 0 });
	});
	it('explains a bad number and names the field', () => {
		const v = fluxFormValues(draft);
		const r = applyFluxForm(draft, { ...v, model_kind: ['manual'], model_flux_jy: ['lots'], model_ref_freq_mhz: ['1400'], model_alpha: [''], model_curvature: [''] });
		expect(r.ok ? null : r.issues[0]).toEqual({ field: 'model_flux_jy', message: 'Flux density of 3C286: "lots" is not a positive number.' });
	});
	it('stores a gain calibrator estimate, which lets the SNR check run', () => {
		const v = fluxFormValues(draft);
		const r = ok(applyFluxForm(draft, { ...v, estimate_jy: ['2.3'] })).draft;
		expect(r.flux_estimates).toEqual([{ field: 'CFA-GCAL-1', flux_jy: 2.3 }]);
		expect(validate(r, obs).some((f) => f.code === 'snr.flux_unknown')).toBe(false);
	});
});

describe('reference, channels and solve screens', () => {
	it('refuses a fallback equal to the primary', () => {
		const r = applyReferenceForm(draft, { primary: 'CF01', fallbacks: ['CF01'] });
		expect(r.ok ? '' : r.issues[0]?.message).toMatch(/appears twice/);
	});
	it('reads typed channel ranges and reports a bad token', () => {
		expect(ok(applyChannelsForm(draft, nChan, { clean: '100-400', excluded: '500–520' })).draft.excluded_channels).toEqual([{ start: 500, end: 520 }]);
		const bad = applyChannelsForm(draft, nChan, { clean: '100-4000', excluded: '' });
		expect(bad.ok ? null : bad.issues[0]?.field).toBe('clean');
	});
	it('removes the delay step and records the reason on the bandpass step', () => {
		const v = solveFormValues(draft);
		const r = ok(applySolveForm(draft, { ...v, delay_enabled: false, bandpass_without_delay_reason: 'delays were removed at the correlator' })).draft;
		expect(r.steps.some((s) => s.kind === 'delay')).toBe(false);
		expect(r.steps.find((s) => s.kind === 'bandpass')).toMatchObject({ without_delay_reason: 'delays were removed at the correlator' });
	});
	it('sets a provisional phase interval in seconds, which the engine then flags as shorter than the scan', () => {
		const v = solveFormValues(draft);
		const r = ok(applySolveForm(draft, { ...v, prep_mode: 'seconds', prep_seconds: '16' })).draft;
		expect(validate(r, obs).find((f) => f.code === 'prep.interval_shorter_than_scan')?.severity).toBe('error');
	});
});

describe('wizard steps', () => {
	it('walks forward and back through the seven screens', () => {
		expect(WIZARD_STEPS).toHaveLength(7);
		expect(nextStep('observation')).toBe('roles');
		expect(nextStep('review')).toBeNull();
		expect(previousStep('roles')).toBe('observation');
		expect(previousStep('observation')).toBeNull();
	});
	it('maps a finding path to the screen that edits it', () => {
		expect(stepForPath('steps[2].interval')).toBe('solve');
		expect(stepForPath('reference_antenna.fallbacks[0]')).toBe('reference');
		expect(stepForPath('clean_channels[0]')).toBe('channels');
		expect(stepForPath('targets[1].gain_calibrator')).toBe('roles');
		expect(stepForPath('flux_models[0].model')).toBe('flux');
	});
});

import { describe, expect, it } from 'vitest';
import { estimateStepSnrs } from './step-snr';
import { createDefaultRecipe } from './defaults';
import { createDemoObservation } from './demo-observation';
import { computeAntennaSnr } from './sensitivity';
import { fluxDensity } from './flux-standards';

describe('estimateStepSnrs', () => {
	const obs = createDemoObservation();
	const recipe = createDefaultRecipe(obs);

	it('estimates every solve step on each of its fields', () => {
		const snrs = estimateStepSnrs(recipe, obs);
		const kinds = new Set(snrs.map((s) => s.kind));
		expect(kinds).toEqual(new Set(['delay', 'bandpass_prep', 'bandpass', 'gain']));
		expect(snrs.every((s) => recipe.steps[s.stepIndex]?.kind === s.kind)).toBe(true);
	});

	it('matches the radiometer equation for the bandpass calibrator (Wrobel & Walker 1999, via METHODS.md §9)', () => {
		const prep = estimateStepSnrs(recipe, obs).find((s) => s.kind === 'bandpass_prep');
		expect(prep?.estimate.ok).toBe(true);
		if (!prep?.estimate.ok) return;
		const e = prep.estimate;
		const spw = obs.spectral_windows[0];
		if (!spw) throw new Error('no window');
		const centre = spw.first_freq_hz + ((spw.n_chan - 1) / 2) * spw.chan_width_hz;
		// SNR_ant = S η √(2 n_c Δν t) √(N−1) / SEFD, evaluated independently of the estimate.
		const expected = computeAntennaSnr({ sefdJy: obs.array.sefd_jy ?? 0, efficiency: obs.array.correlator_efficiency ?? 0, bandwidthHz: e.bandwidthHz, correlations: 2, antennas: e.antennas, fluxJy: fluxDensity({ kind: 'standard', standard: '3C286' }, centre), timeS: e.timeS });
		expect(e.snr).toBeCloseTo(expected, 6);
		expect(e.plan.solutionS).toBeLessThanOrEqual(e.timeS);
	});

	it('reports why an estimate is impossible without an observation', () => {
		const snrs = estimateStepSnrs(recipe, null);
		expect(snrs.length).toBeGreaterThan(0);
		expect(snrs.every((s) => !s.estimate.ok && s.estimate.reason === 'no_observation')).toBe(true);
	});
});

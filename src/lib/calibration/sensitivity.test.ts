import { describe, expect, it } from 'vitest';
import {
	computeAntennaSnr,
	computeBaselineNoiseJy,
	computeBaselineSnr,
	computeDelayResolutionNs,
	computeImageNoiseJy,
	computeMinimumIntervalS,
	computeUnambiguousDelayNs,
	planSolutionInterval,
	roundToIntegrations
} from './sensitivity';

// Worked example of METHODS.md §9 (radiometer equation of Wrobel & Walker 1999, SIRA II lecture 9):
// N = 64, SEFD = 400 Jy, S = 1 Jy, Δν = 200 MHz, t_int = 8 s. The table prints 3–5 significant figures,
// so comparisons allow half a unit in the last printed place.
const base = { sefdJy: 400, bandwidthHz: 200e6, antennas: 64 };

describe('radiometer equation (Wrobel & Walker 1999, via METHODS.md §9)', () => {
	it('gives the per-correlation noise for 8 s', () => {
		expect(computeBaselineNoiseJy({ ...base, efficiency: 1, timeS: 8, correlations: 1 }) * 1e3).toBeCloseTo(7.071, 3);
		expect(computeBaselineNoiseJy({ ...base, efficiency: 0.88, timeS: 8, correlations: 1 }) * 1e3).toBeCloseTo(8.035, 3);
	});

	it('gives SNR_bl for one and two correlations', () => {
		for (const [eta, one, two] of [[1, 141.42, 200.0], [0.88, 124.45, 176.0]] as const) {
			expect(computeBaselineSnr({ ...base, fluxJy: 1, efficiency: eta, timeS: 8, correlations: 1 })).toBeCloseTo(one, 2);
			expect(computeBaselineSnr({ ...base, fluxJy: 1, efficiency: eta, timeS: 8, correlations: 2 })).toBeCloseTo(two, 2);
		}
	});

	it('gives SNR_ant = SNR_bl·√63 and the antenna phase error', () => {
		for (const [eta, snr, phaseDeg] of [[1, 1122.5, 0.051], [0.88, 987.8, 0.058]] as const) {
			const value = computeAntennaSnr({ ...base, fluxJy: 1, efficiency: eta, timeS: 8, correlations: 1 });
			expect(Math.abs(value - snr)).toBeLessThan(0.05);
			// σ_φ = 1/SNR rad at high SNR (METHODS.md §9)
			expect((1 / value) * (180 / Math.PI)).toBeCloseTo(phaseDeg, 3);
		}
	});

	it('gives the bandpass SNR_ant per 195.3125 kHz channel for 8 s and 600 s', () => {
		const channel = { ...base, bandwidthHz: 200e6 / 1024, fluxJy: 1, correlations: 1 };
		for (const [eta, s8, s600] of [[1, 35.08, 303.78], [0.88, 30.87, 267.33]] as const) {
			expect(computeAntennaSnr({ ...channel, efficiency: eta, timeS: 8 })).toBeCloseTo(s8, 2);
			expect(computeAntennaSnr({ ...channel, efficiency: eta, timeS: 600 })).toBeCloseTo(s600, 2);
		}
	});

	it('gives the image noise for 1 h with two polarisations', () => {
		// METHODS.md §9: 5.250 μJy for η_c = 1.
		expect(computeImageNoiseJy({ ...base, efficiency: 1, timeS: 3600, correlations: 2 }) * 1e6).toBeCloseTo(5.25, 3);
	});
});

describe('minimum solution interval (METHODS.md §9 worked example)', () => {
	it('needs well under one integration for a 1 Jy source', () => {
		for (const [eta, t3ms, t10ms] of [[1, 0.057, 0.635], [0.88, 0.074, 0.82]] as const) {
			const t3 = computeMinimumIntervalS({ ...base, fluxJy: 1, efficiency: eta, correlations: 1, snr: 3 });
			const t10 = computeMinimumIntervalS({ ...base, fluxJy: 1, efficiency: eta, correlations: 1, snr: 10 });
			expect(t3 * 1e3).toBeCloseTo(t3ms, 3);
			expect(t10 * 1e3).toBeCloseTo(t10ms, 3);
			expect(roundToIntegrations(t10, 8)).toBe(8);
		}
	});

	it('rounds up to whole integrations for faint sources', () => {
		const rows = [
			// S, SNR_ant, η_c, t_min, t_sol
			[0.005, 5, 1, 6.349, 8],
			[0.005, 5, 0.88, 8.199, 16],
			[0.002, 10, 1, 158.73, 160],
			[0.002, 10, 0.88, 204.97, 208]
		] as const;
		for (const [flux, snr, eta, tMin, tSol] of rows) {
			const plan = planSolutionInterval({ ...base, fluxJy: flux, efficiency: eta, correlations: 1, snr, integrationS: 8, scanS: 600 });
			expect(Math.abs(plan.minimumS - tMin)).toBeLessThan(0.006);
			expect(plan.solutionS).toBe(tSol);
			expect(plan.snrAtSolution).toBeGreaterThanOrEqual(snr);
			expect(plan.feasible).toBe(true);
		}
	});

	it('reports an interval longer than the scan as infeasible', () => {
		// Same 2 mJy row (160 s needed) against a 120 s scan: infeasible by the project rule of METHODS.md §9.
		const plan = planSolutionInterval({ ...base, fluxJy: 0.002, efficiency: 1, correlations: 1, snr: 10, integrationS: 8, scanS: 120 });
		expect(plan.feasible).toBe(false);
	});

	it('keeps exact multiples of the integration time', () => {
		// 2 integrations exactly must not become 3 through float noise (common practice: t_sol is a whole number of dumps).
		expect(roundToIntegrations(16.000000000000004, 8)).toBe(16);
		expect(roundToIntegrations(16.01, 8)).toBe(24);
		expect(roundToIntegrations(0, 8)).toBe(8);
	});
});

describe('delay range (METHODS.md §2 and §9)', () => {
	it('gives ±500 ns for 1 MHz channels and 2.56 μs for 195.3125 kHz', () => {
		expect(computeUnambiguousDelayNs(1e6)).toBeCloseTo(500, 9);
		expect(computeUnambiguousDelayNs(-1e6)).toBeCloseTo(500, 9);
		expect(computeUnambiguousDelayNs(200e6 / 1024)).toBeCloseTo(2560, 9);
	});

	it('gives 5 ns resolution for 200 MHz', () => {
		expect(computeDelayResolutionNs(200e6)).toBeCloseTo(5, 12);
	});
});

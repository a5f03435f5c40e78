/*
 * Radiometer-equation planning (METHODS.md §9, after Wrobel & Walker 1999): thermal noise per baseline, the
 * signal-to-noise of baseline- and antenna-based solutions, the shortest solution interval for a target SNR,
 * and the delay range a channel spacing allows (§2).
 */

export type NoiseInput = {
	sefdJy: number;
	/** Correlator (quantisation) efficiency η_c, 0 < η_c ≤ 1. */
	efficiency: number;
	bandwidthHz: number;
	timeS: number;
	/** Parallel-hand correlations combined into one estimate (1 or 2). */
	correlations: number;
};

/** σ = SEFD / (η_c √(2 n_c Δν t)): rms of the real part on one baseline, Jy. */
export function computeBaselineNoiseJy(input: NoiseInput): number {
	return input.sefdJy / (input.efficiency * Math.sqrt(2 * input.correlations * input.bandwidthHz * input.timeS));
}

/** SNR_bl = S / σ for a point source of `fluxJy`. */
export function computeBaselineSnr(input: NoiseInput & { fluxJy: number }): number {
	return input.fluxJy / computeBaselineNoiseJy(input);
}

/** SNR_ant ≈ SNR_bl · √(N − 1): each antenna enters N − 1 baselines (rule of thumb, METHODS.md §9). */
export function computeAntennaSnr(input: NoiseInput & { fluxJy: number; antennas: number }): number {
	return computeBaselineSnr(input) * Math.sqrt(Math.max(input.antennas - 1, 0));
}

export type IntervalInput = Omit<NoiseInput, 'timeS'> & { fluxJy: number; antennas: number; snr: number };

/** t_min = (SNR · SEFD / (η_c S √(N − 1)))² / (2 Δν n_c), seconds; Infinity with fewer than 2 antennas. */
export function computeMinimumIntervalS(input: IntervalInput): number {
	if (input.antennas < 2) return Infinity;
	const ratio = (input.snr * input.sefdJy) / (input.efficiency * input.fluxJy * Math.sqrt(input.antennas - 1));
	return (ratio * ratio) / (2 * input.bandwidthHz * input.correlations);
}

/** t_sol = t_int · ceil(t_min / t_int), at least one integration. */
export function roundToIntegrations(minimumS: number, integrationS: number): number {
	if (!Number.isFinite(minimumS)) return Infinity;
	// A relative tolerance keeps an exact multiple (e.g. 16 s at 8 s dumps) from rounding up by float noise.
	const count = Math.max(1, Math.ceil(minimumS / integrationS - 1e-9));
	return count * integrationS;
}

export type IntervalPlan = {
	minimumS: number;
	solutionS: number;
	/** SNR_ant reached at `solutionS`. */
	snrAtSolution: number;
	/** False when even the whole scan is too short (project choice, METHODS.md §9). */
	feasible: boolean;
};

/** Shortest whole-integration interval that reaches the SNR, and whether it fits in a scan of `scanS`. */
export function planSolutionInterval(input: IntervalInput & { integrationS: number; scanS: number }): IntervalPlan {
	const minimumS = computeMinimumIntervalS(input);
	const solutionS = roundToIntegrations(minimumS, input.integrationS);
	const snrAtSolution = Number.isFinite(solutionS) ? computeAntennaSnr({ ...input, timeS: solutionS }) : 0;
	return { minimumS, solutionS, snrAtSolution, feasible: solutionS <= input.scanS };
}

/** Delays are unambiguous for |τ| < 1/(2|Δν|) (METHODS.md §2); nanoseconds. */
export function computeUnambiguousDelayNs(chanWidthHz: number): number {
	return 1e9 / (2 * Math.abs(chanWidthHz));
}

/** Width of the delay response ≈ 1/B for a total bandwidth B (METHODS.md §2); nanoseconds. */
export function computeDelayResolutionNs(bandwidthHz: number): number {
	return 1e9 / Math.abs(bandwidthHz);
}

/** Image noise ΔI = SEFD / (η_c √(n_p N (N − 1) Δν t)), Jy (Wrobel & Walker 1999, via METHODS.md §9). */
export function computeImageNoiseJy(input: NoiseInput & { antennas: number }): number {
	const n = input.antennas;
	return input.sefdJy / (input.efficiency * Math.sqrt(input.correlations * n * (n - 1) * input.bandwidthHz * input.timeS));
}

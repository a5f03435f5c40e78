import { fluxDensity, FLUX_STANDARDS, isWithinValidity, spectralIndex } from '$lib/calibration/flux-standards';
import type { FluxModel } from '$lib/calibration/recipe';
import { sampleLogSpaced } from './plot-scale';

export type SpectrumPoint = { freqHz: number; fluxJy: number; extrapolated: boolean };
export type SpectrumSegment = { extrapolated: boolean; points: SpectrumPoint[] };

export type FluxSpectrum = {
	points: SpectrumPoint[];
	/** Runs of points inside or outside the model's fitted range; neighbouring runs share their boundary point. */
	segments: SpectrumSegment[];
	/** The window centre: mean of the lowest and highest frequency (as for the window's channel centres). */
	centreHz: number;
	centreFluxJy: number;
	centreSpectralIndex: number;
	centreExtrapolated: boolean;
	/** The fitted range of a standard; null for a manual model, which carries none. */
	validity: { minHz: number; maxHz: number } | null;
	anyExtrapolated: boolean;
};

/** Sample a flux model's S(ν) over a band, log-spaced, marking points outside the model's fitted range. */
export function computeFluxSpectrum(model: FluxModel, minFreqHz: number, maxFreqHz: number, samples = 48): FluxSpectrum {
	const lo = Math.min(minFreqHz, maxFreqHz);
	const hi = Math.max(minFreqHz, maxFreqHz);
	const points = sampleLogSpaced(lo, hi, lo === hi ? 1 : Math.max(2, samples)).map((freqHz) => ({
		freqHz,
		fluxJy: fluxDensity(model, freqHz),
		extrapolated: !isWithinValidity(model, freqHz)
	}));
	const segments: SpectrumSegment[] = [];
	for (const p of points) {
		const current = segments[segments.length - 1];
		if (current && current.extrapolated === p.extrapolated) current.points.push(p);
		else {
			const prev = current?.points[current.points.length - 1];
			segments.push({ extrapolated: p.extrapolated, points: prev ? [prev, p] : [p] });
		}
	}
	const centreHz = (lo + hi) / 2;
	const std = model.kind === 'standard' ? FLUX_STANDARDS[model.standard] : null;
	return {
		points,
		segments,
		centreHz,
		centreFluxJy: fluxDensity(model, centreHz),
		centreSpectralIndex: spectralIndex(model, centreHz),
		centreExtrapolated: !isWithinValidity(model, centreHz),
		validity: std ? { minHz: std.valid_min_hz, maxHz: std.valid_max_hz } : null,
		anyExtrapolated: points.some((p) => p.extrapolated)
	};
}

/** A frequency in the unit that reads best: "408 MHz", "1.400 GHz". */
export function formatFrequency(hz: number): string {
	if (hz >= 1e9) return `${(hz / 1e9).toFixed(3)} GHz`;
	return `${(hz / 1e6).toFixed(hz >= 1e8 ? 1 : 3)} MHz`;
}

/** A flux density with four significant figures: "15.08 Jy", "0.4520 Jy". */
export function formatFluxJy(jy: number): string {
	return `${jy.toPrecision(4)} Jy`;
}

import { describe, expect, it } from 'vitest';
import { computeFluxSpectrum, formatFluxJy, formatFrequency } from './flux-spectrum';

describe('computeFluxSpectrum', () => {
	it('prints the standard model value and spectral index at the window centre', () => {
		// Band 1.0–1.8 GHz has its centre at 1.4 GHz. 3C286 there: S = 15.0838 Jy, α = −0.5010
		// (Perley & Butler 2017, via METHODS.md §8).
		const spectrum = computeFluxSpectrum({ kind: 'standard', standard: '3C286' }, 1.0e9, 1.8e9);
		expect(spectrum.centreHz).toBe(1.4e9);
		expect(spectrum.centreFluxJy).toBeCloseTo(15.0838, 3);
		expect(spectrum.centreSpectralIndex).toBeCloseTo(-0.501, 3);
		expect(spectrum.anyExtrapolated).toBe(false);
	});

	it('samples the band ends with the model values there', () => {
		// 3C286 at 1.0 GHz: 17.7052 Jy (Perley & Butler 2017, via METHODS.md §8); 3.0 GHz: 9.9085 Jy (same table).
		const spectrum = computeFluxSpectrum({ kind: 'standard', standard: '3C286' }, 1.0e9, 3.0e9, 10);
		expect(spectrum.points).toHaveLength(10);
		expect(spectrum.points[0]?.fluxJy).toBeCloseTo(17.7052, 3);
		expect(spectrum.points[9]?.freqHz).toBeCloseTo(3.0e9, 0);
		expect(spectrum.points[9]?.fluxJy).toBeCloseTo(9.9085, 3);
	});

	it('marks points below the fitted range of PKS B1934-638 as extrapolated', () => {
		// Reynolds 1994 model, fitted 408–8640 MHz (via METHODS.md §8).
		const spectrum = computeFluxSpectrum({ kind: 'standard', standard: 'PKS B1934-638' }, 300e6, 600e6, 20);
		expect(spectrum.validity).toEqual({ minHz: 408e6, maxHz: 8640e6 });
		expect(spectrum.anyExtrapolated).toBe(true);
		for (const p of spectrum.points) expect(p.extrapolated).toBe(p.freqHz < 408e6);
		// One run outside, then one inside, joined at their shared boundary point.
		expect(spectrum.segments.map((s) => s.extrapolated)).toEqual([true, false]);
		const [outside, inside] = spectrum.segments;
		expect(inside?.points[0]).toBe(outside?.points[outside.points.length - 1]);
		// The centre, 450 MHz, lies inside the fitted range.
		expect(spectrum.centreExtrapolated).toBe(false);
	});

	it('evaluates a manual model to its own flux at its reference frequency', () => {
		// log10 S = log10 S0 + α·x + β·x², x = log10(ν/ν0) (DESIGN.md manual model): at ν = ν0, S = S0 and dlogS/dlogν = α.
		const model = { kind: 'manual' as const, flux_jy: 2.5, ref_freq_hz: 1.25e9, spectral_index: -0.7, curvature: 0.1 };
		const spectrum = computeFluxSpectrum(model, 1.0e9, 1.5e9);
		expect(spectrum.centreFluxJy).toBeCloseTo(2.5, 12);
		expect(spectrum.centreSpectralIndex).toBeCloseTo(-0.7, 12);
		expect(spectrum.validity).toBeNull();
		expect(spectrum.anyExtrapolated).toBe(false);
	});

	it('accepts a band given high frequency first', () => {
		const spectrum = computeFluxSpectrum({ kind: 'standard', standard: '3C286' }, 1.8e9, 1.0e9, 5);
		expect(spectrum.points[0]?.freqHz).toBeCloseTo(1.0e9, 0);
		expect(spectrum.centreHz).toBe(1.4e9);
	});
});

describe('formatting', () => {
	it('formats frequencies and flux densities', () => {
		expect(formatFrequency(1.4e9)).toBe('1.400 GHz');
		expect(formatFrequency(408e6)).toBe('408.0 MHz');
		expect(formatFluxJy(15.0838)).toBe('15.08 Jy');
	});
});

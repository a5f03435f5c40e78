import type { ChannelRange, FieldRole, FluxModel, SolutionInterval, StepKind } from '../../calibration/recipe';
import { FLUX_STANDARDS } from '../../calibration/flux-standards';

// Plain-English renderings of recipe values, shared by the parameter diff and any view.

const MINUS = '\u2212';
const EN_DASH = '\u2013';

/** A number without floating-point noise, with a true minus sign. */
export function formatNumber(value: number, options: { minDecimals?: number } = {}): string {
	const rounded = Number(value.toPrecision(10));
	let text = String(rounded);
	const minDecimals = options.minDecimals ?? 0;
	if (minDecimals > 0 && !/[.e]/.test(text)) text = `${text}.${'0'.repeat(minDecimals)}`;
	return text.replace(/-/g, MINUS);
}

/** "per integration", "per scan", "60 s", "whole observation". */
export function formatInterval(interval: SolutionInterval): string {
	switch (interval.mode) {
		case 'integration':
			return 'per integration';
		case 'scan':
			return 'per scan';
		case 'seconds':
			return `${formatNumber(interval.seconds)} s`;
		case 'observation':
			return 'whole observation';
	}
}

/** Frequency with the largest unit that keeps the number at or above 1. */
export function formatFrequency(hz: number): string {
	const units: [number, string][] = [[1e9, 'GHz'], [1e6, 'MHz'], [1e3, 'kHz']];
	for (const [scale, unit] of units) if (Math.abs(hz) >= scale) return `${formatNumber(hz / scale)} ${unit}`;
	return `${formatNumber(hz)} Hz`;
}

/** "Perley & Butler 2017 standard" or "manual 15.0 Jy at 1.4 GHz, α −0.5". */
export function formatFluxModel(model: FluxModel, field: string): string {
	if (model.kind === 'standard') {
		const citation = FLUX_STANDARDS[model.standard].citation;
		const short = citation.split(',')[0] ?? citation;
		return model.standard === field ? `${short} standard` : `${short} standard of ${model.standard}`;
	}
	const parts = [`manual ${formatNumber(model.flux_jy, { minDecimals: 1 })} Jy at ${formatFrequency(model.ref_freq_hz)}`, `\u03b1 ${formatNumber(model.spectral_index)}`];
	if (model.curvature !== 0) parts.push(`curvature ${formatNumber(model.curvature)}`);
	return parts.join(', ');
}

/** "100–400"; a single channel as "100". */
export function formatChannelRange(range: ChannelRange): string {
	return range.start === range.end ? String(range.start) : `${range.start}${EN_DASH}${range.end}`;
}

/** Ranges in channel order, or "none". */
export function formatChannelRanges(ranges: readonly ChannelRange[]): string {
	return ranges.length === 0 ? 'none' : sortRanges(ranges).map(formatChannelRange).join(', ');
}

/** A copy sorted by start, then end. */
export function sortRanges(ranges: readonly ChannelRange[]): ChannelRange[] {
	return [...ranges].sort((x, y) => x.start - y.start || x.end - y.end);
}

const ROLE_WORDS: Record<FieldRole, string> = {
	flux_calibrator: 'flux calibrator',
	bandpass_calibrator: 'bandpass calibrator',
	delay_calibrator: 'delay calibrator',
	gain_calibrator: 'gain calibrator',
	target: 'target'
};

/** "flux calibrator, bandpass calibrator", or "no role". */
export function formatRoles(roles: readonly FieldRole[]): string {
	return roles.length === 0 ? 'no role' : roles.map((r) => ROLE_WORDS[r]).join(', ');
}

/** Names joined by commas, or "none". */
export function formatList(items: readonly string[]): string {
	return items.length === 0 ? 'none' : items.join(', ');
}

/** User text in quotes, cut to one short line for a label. */
export function formatTextPreview(text: string, max = 60): string {
	const oneLine = text.replace(/\s+/g, ' ').trim();
	if (oneLine.length === 0) return 'empty';
	return `\u201c${oneLine.length > max ? `${oneLine.slice(0, max - 1)}\u2026` : oneLine}\u201d`;
}

/** The step's name inside a sentence: "Step added: delay". */
export const STEP_NOUNS: Record<StepKind, string> = {
	delay: 'delay',
	bandpass_prep: 'provisional phase solve',
	bandpass: 'bandpass',
	gain: 'gain',
	flux_bootstrap: 'flux bootstrap',
	apply: 'apply',
	verify: 'verify'
};

/** The step's name at the start of a label: "Gain solve interval". */
export const STEP_TITLES: Record<StepKind, string> = {
	delay: 'Delay solve',
	bandpass_prep: 'Provisional phase solve',
	bandpass: 'Bandpass solve',
	gain: 'Gain solve',
	flux_bootstrap: 'Flux bootstrap',
	apply: 'Apply',
	verify: 'Verify'
};

import type { ObservationSummary } from './observation-schema';
import type { ChannelRange, FluxModel, RecipeParams, Step } from './recipe';
import { rankSummaryAntennas } from './reference-antenna';
import { computeUnambiguousDelayNs } from './sensitivity';
import { suggestRoles } from './suggest-roles';
import type { FieldRole } from './field-role';

/** Minimum SNR per solve (METHODS.md §9 thresholds, common practice / project choice). */
export const DEFAULT_MIN_SNR = { delay: 5, bandpass_prep: 3, bandpass: 10, gain_phase: 3, gain_complex: 5 } as const;
/** Verification limits (METHODS.md §12, common practice; project choice). */
export const DEFAULT_VERIFY = { max_amplitude_scatter_pct: 5, max_phase_rms_deg: 5 } as const;
/** Residual delays after the correlator's model are a few ns (common practice); 50 ns leaves ample margin. */
export const DEFAULT_DELAY_WINDOW_NS = 50;
const FALLBACK_COUNT = 3;
const CLEAN_FRACTION = 0.1;

/** The central ~10 % of a window's channels (a few to ~10 % of the band near centre: common practice, METHODS.md §5). */
export function createCentralChannels(nChan: number): ChannelRange[] {
	const width = Math.max(1, Math.round(CLEAN_FRACTION * nChan));
	const start = Math.floor((nChan - width) / 2);
	return [{ start, end: start + width - 1 }];
}

function withRole(fields: { name: string; roles: FieldRole[] }[], role: FieldRole): string[] {
	return fields.filter((f) => f.roles.includes(role)).map((f) => f.name);
}

/** A sensible starting recipe for an observation: it validates with no errors when the observation allows it. */
export function createDefaultRecipe(summary: ObservationSummary, options: { title?: string } = {}): RecipeParams {
	const suggestion = suggestRoles(summary);
	const fields = suggestion.fields.filter((f) => f.roles.length > 0).map((f) => ({ name: f.name, roles: f.roles }));
	const flux = withRole(fields, 'flux_calibrator');
	const bandpass = withRole(fields, 'bandpass_calibrator');
	const delayRole = withRole(fields, 'delay_calibrator');
	const delay = delayRole.length > 0 ? delayRole : bandpass;
	const gainCals = withRole(fields, 'gain_calibrator');
	const targets = withRole(fields, 'target');
	const calibrators = fields.filter((f) => !f.roles.includes('target')).map((f) => f.name);

	const flux_models: { field: string; model: FluxModel }[] = [];
	for (const f of suggestion.fields) {
		if (f.standard && f.roles.includes('flux_calibrator')) flux_models.push({ field: f.name, model: { kind: 'standard', standard: f.standard } });
	}

	const spw = summary.spectral_windows[0];
	const nChan = spw?.n_chan ?? 1;
	const ranked = rankSummaryAntennas(summary).filter((r) => r.eligible);
	const unambiguousNs = spw ? computeUnambiguousDelayNs(spw.chan_width_hz) : Infinity;

	const steps: Step[] = [];
	if (delay.length > 0) {
		steps.push({
			kind: 'delay',
			fields: delay,
			interval: { mode: 'scan' },
			min_snr: DEFAULT_MIN_SNR.delay,
			search_window_ns: Math.min(DEFAULT_DELAY_WINDOW_NS, Math.floor(0.9 * unambiguousNs))
		});
	}
	steps.push({ kind: 'bandpass_prep', fields: bandpass, interval: { mode: 'scan' }, solve_for: 'phase', min_snr: DEFAULT_MIN_SNR.bandpass_prep });
	steps.push({ kind: 'bandpass', fields: bandpass, interval: { mode: 'scan' }, min_snr: DEFAULT_MIN_SNR.bandpass });
	steps.push({
		kind: 'gain',
		fields: [...new Set([...flux, ...gainCals])],
		interval: { mode: 'scan' },
		solve_for: 'amplitude_and_phase',
		min_snr: DEFAULT_MIN_SNR.gain_complex
	});
	const scaled = gainCals.filter((g) => !flux.includes(g));
	if (flux.length > 0 && scaled.length > 0) steps.push({ kind: 'flux_bootstrap', fields: scaled });
	steps.push({ kind: 'apply', fields: [...calibrators, ...targets] });
	steps.push({ kind: 'verify', fields: calibrators, ...DEFAULT_VERIFY });

	return {
		schema_version: 1,
		title: (options.title?.trim() || `Calibration of ${summary.name}`).slice(0, 200),
		notes: '',
		spectral_window_id: spw?.id ?? 0,
		fields,
		flux_models,
		flux_estimates: [],
		targets: suggestion.targets.map((t) => ({ field: t.field, gain_calibrator: t.gain_calibrator, interpolation: 'linear' as const })),
		reference_antenna: { primary: ranked[0]?.name ?? summary.array.antennas[0]?.name ?? '', fallbacks: ranked.slice(1, 1 + FALLBACK_COUNT).map((r) => r.name) },
		clean_channels: createCentralChannels(nChan),
		excluded_channels: [],
		steps
	};
}

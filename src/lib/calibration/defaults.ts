import type { ObservationSummary } from './observation-schema';
import type { ChannelRange, FluxModel, RecipeParams, Step, StepKind } from './recipe';
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

/** Names of the fields that hold `role`. */
export function listFieldsWithRole(fields: readonly { name: string; roles: readonly FieldRole[] }[], role: FieldRole): string[] {
	return fields.filter((f) => f.roles.includes(role)).map((f) => f.name);
}

/** The fields a step of `kind` works on, from the recipe's field roles. */
export function computeStepFields(fields: readonly { name: string; roles: readonly FieldRole[] }[], kind: StepKind): string[] {
	const flux = listFieldsWithRole(fields, 'flux_calibrator');
	const bandpass = listFieldsWithRole(fields, 'bandpass_calibrator');
	const gainCals = listFieldsWithRole(fields, 'gain_calibrator');
	const calibrators = (): string[] => fields.filter((f) => f.roles.length > 0 && !f.roles.includes('target')).map((f) => f.name);
	switch (kind) {
		case 'delay': {
			const delay = listFieldsWithRole(fields, 'delay_calibrator');
			return delay.length > 0 ? delay : bandpass;
		}
		case 'bandpass_prep':
		case 'bandpass':
			return bandpass;
		case 'gain':
			return [...new Set([...flux, ...gainCals])];
		case 'flux_bootstrap':
			return gainCals.filter((g) => !flux.includes(g));
		case 'apply':
			return [...calibrators(), ...listFieldsWithRole(fields, 'target')];
		case 'verify':
			return calibrators();
	}
}

/** A sensible starting recipe for an observation: it validates with no errors when the observation allows it. */
export function createDefaultRecipe(summary: ObservationSummary, options: { title?: string } = {}): RecipeParams {
	const suggestion = suggestRoles(summary);
	const fields = suggestion.fields.filter((f) => f.roles.length > 0).map((f) => ({ name: f.name, roles: f.roles }));
	const flux = listFieldsWithRole(fields, 'flux_calibrator');
	const delay = computeStepFields(fields, 'delay');
	const bandpass = computeStepFields(fields, 'bandpass');

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
		fields: computeStepFields(fields, 'gain'),
		interval: { mode: 'scan' },
		solve_for: 'amplitude_and_phase',
		min_snr: DEFAULT_MIN_SNR.gain_complex
	});
	const scaled = computeStepFields(fields, 'flux_bootstrap');
	if (flux.length > 0 && scaled.length > 0) steps.push({ kind: 'flux_bootstrap', fields: scaled });
	steps.push({ kind: 'apply', fields: computeStepFields(fields, 'apply') });
	steps.push({ kind: 'verify', fields: computeStepFields(fields, 'verify'), ...DEFAULT_VERIFY });

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

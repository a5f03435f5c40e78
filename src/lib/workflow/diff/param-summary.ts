import type { RecipeParams, Step } from '../../calibration/recipe';
import { formatChannelRanges, formatFluxModel, formatInterval, formatList, formatNumber, formatRoles, STEP_TITLES } from './param-format';

export type ParamSummaryRow = { label: string; value: string };

function describeStep(s: Step): string {
	const on = s.fields.length > 0 ? ` on ${formatList(s.fields)}` : '';
	switch (s.kind) {
		case 'delay':
			return `${formatInterval(s.interval)}${on}, minimum SNR ${formatNumber(s.min_snr)}, search window ±${formatNumber(s.search_window_ns)} ns`;
		case 'bandpass_prep':
			return `phase only, ${formatInterval(s.interval)}${on}, minimum SNR ${formatNumber(s.min_snr)}`;
		case 'bandpass':
			return `${formatInterval(s.interval)}${on}, minimum SNR ${formatNumber(s.min_snr)}${s.without_delay_reason ? `; no delay solve because: ${s.without_delay_reason}` : ''}`;
		case 'gain':
			return `${s.solve_for === 'phase' ? 'phase only' : 'amplitude and phase'}, ${formatInterval(s.interval)}${on}, minimum SNR ${formatNumber(s.min_snr)}`;
		case 'flux_bootstrap':
			return `scales ${formatList(s.fields)}`;
		case 'apply':
			return `corrects ${formatList(s.fields)}`;
		case 'verify':
			return `checks ${formatList(s.fields)}: amplitude scatter ≤ ${formatNumber(s.max_amplitude_scatter_pct)} %, phase rms ≤ ${formatNumber(s.max_phase_rms_deg)}°`;
	}
}

/** The decisions of a recipe in the trade's plain words, one row each (version pages, reviews). */
export function summariseParams(p: RecipeParams): ParamSummaryRow[] {
	return [
		{ label: 'Title', value: p.title },
		...(p.notes ? [{ label: 'Notes', value: p.notes }] : []),
		{ label: 'Spectral window', value: String(p.spectral_window_id) },
		...p.fields.map((f) => ({ label: `Field roles of ${f.name}`, value: formatRoles(f.roles) })),
		...p.flux_models.map((m) => ({ label: `Flux model of ${m.field}`, value: formatFluxModel(m.model, m.field) })),
		...p.flux_estimates.map((e) => ({ label: `Flux estimate of ${e.field}`, value: `${formatNumber(e.flux_jy)} Jy` })),
		...p.targets.map((t) => ({ label: `Gain calibrator of ${t.field}`, value: `${t.gain_calibrator} (${t.interpolation} interpolation)` })),
		{ label: 'Reference antenna', value: p.reference_antenna.primary },
		{ label: 'Fallback reference antennas', value: p.reference_antenna.fallbacks.length > 0 ? formatList(p.reference_antenna.fallbacks) : 'none' },
		{ label: 'Clean channels', value: p.clean_channels.length > 0 ? formatChannelRanges(p.clean_channels) : 'none' },
		{ label: 'Excluded channels', value: p.excluded_channels.length > 0 ? formatChannelRanges(p.excluded_channels) : 'none' },
		...p.steps.map((s, i) => ({ label: `Step ${i + 1}: ${STEP_TITLES[s.kind]}`, value: describeStep(s) }))
	];
}

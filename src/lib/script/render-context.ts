/**
 * The render context: the only data a script template can read (the contract is
 * documented for template authors in templates/README.md).
 */

/** A solution interval as templates see it: `seconds` is null unless mode is 'seconds'. */
export type RenderInterval =
	| { mode: 'integration' | 'scan' | 'observation'; seconds: null }
	| { mode: 'seconds'; seconds: number };

/** log10 S[Jy] = Σ c_i (log10(ν / freq_unit_hz))^i. */
export type RenderLogPolynomialModel = {
	kind: 'log_polynomial';
	coefficients: number[];
	freq_unit_hz: number;
	citation: string;
	valid_min_hz: number;
	valid_max_hz: number;
};

/** log10 S = log10 flux_jy + spectral_index·x + curvature·x², x = log10(ν / ref_freq_hz). */
export type RenderPowerLawModel = {
	kind: 'power_law';
	flux_jy: number;
	ref_freq_hz: number;
	spectral_index: number;
	curvature: number;
};

export type RenderFluxModel = RenderLogPolynomialModel | RenderPowerLawModel;

/** Everything a template may read: `header` for the top comment, `p` for the parameters. */
export type RenderContext = {
	header: {
		title: string;
		recipe_id: string;
		recipe_version: number;
		template_name: string;
		template_version: number;
		params_sha256: string;
	};
	p: {
		title: string;
		notes: string;
		spectral_window_id: number;
		field_roles: Record<string, string[]>;
		targets: { field: string; gain_calibrator: string; interpolation: 'linear' | 'nearest' }[];
		reference_antenna: string;
		reference_fallbacks: string[];
		clean_channels: [number, number][];
		excluded_channels: [number, number][];
		flux_models: Record<string, RenderFluxModel>;
		steps: string[];
		delay: null | { fields: string[]; interval: RenderInterval; min_snr: number; search_window_ns: number };
		bandpass_prep: null | { fields: string[]; interval: RenderInterval; min_snr: number };
		bandpass: null | { fields: string[]; interval: RenderInterval; min_snr: number };
		gain: null | { fields: string[]; interval: RenderInterval; solve_for: 'phase' | 'amplitude_and_phase'; min_snr: number };
		flux_bootstrap: null | { fields: string[] };
		apply: null | { fields: string[] };
		verify: null | { fields: string[]; max_amplitude_scatter_pct: number; max_phase_rms_deg: number };
	};
};

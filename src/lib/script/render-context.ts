/**
 * The render context: the only data a script template can read (the contract is
 * documented for template authors in templates/README.md).
 */
import { FLUX_STANDARDS } from '../calibration/flux-standards';
import type { ObservationSummary } from '../calibration/observation-schema';
import type { FluxModel, RecipeParams, SolutionInterval, Step, StepKind, StepOf } from '../calibration/recipe';
import { paramsSha256 } from './sha256';

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

/** What the renderer needs to know about a recipe version. */
export type RenderContextInput = {
	recipe: RecipeParams;
	/** Part of the agreed input so callers pass what they have; the current context does not read it. */
	observation: ObservationSummary | null;
	recipeId: string;
	recipeVersion: number;
	templateName: string;
	templateVersion: number;
};

function toRenderInterval(interval: SolutionInterval): RenderInterval {
	return interval.mode === 'seconds' ? { mode: 'seconds', seconds: interval.seconds } : { mode: interval.mode, seconds: null };
}

function toRenderFluxModel(model: FluxModel): RenderFluxModel {
	if (model.kind === 'manual') {
		return { kind: 'power_law', flux_jy: model.flux_jy, ref_freq_hz: model.ref_freq_hz, spectral_index: model.spectral_index, curvature: model.curvature };
	}
	const standard = FLUX_STANDARDS[model.standard];
	return {
		kind: 'log_polynomial',
		coefficients: [...standard.coefficients],
		freq_unit_hz: standard.freq_unit_hz,
		citation: standard.citation,
		valid_min_hz: standard.valid_min_hz,
		valid_max_hz: standard.valid_max_hz
	};
}

/** The first step of a kind (validation rejects repeated kinds; the renderer does not re-check). */
function findStep<K extends StepKind>(steps: readonly Step[], kind: K): StepOf<K> | undefined {
	return steps.find((step): step is StepOf<K> => step.kind === kind);
}

// Object.fromEntries defines own properties, so a field called "__proto__" stays a key.
function toRecord<V>(entries: Iterable<readonly [string, V]>): Record<string, V> {
	return Object.fromEntries(entries);
}

function buildStepContext(steps: readonly Step[]): Pick<RenderContext['p'], StepKind> {
	const delay = findStep(steps, 'delay');
	const prep = findStep(steps, 'bandpass_prep');
	const bandpass = findStep(steps, 'bandpass');
	const gain = findStep(steps, 'gain');
	const bootstrap = findStep(steps, 'flux_bootstrap');
	const apply = findStep(steps, 'apply');
	const verify = findStep(steps, 'verify');
	return {
		delay: delay
			? { fields: [...delay.fields], interval: toRenderInterval(delay.interval), min_snr: delay.min_snr, search_window_ns: delay.search_window_ns }
			: null,
		bandpass_prep: prep ? { fields: [...prep.fields], interval: toRenderInterval(prep.interval), min_snr: prep.min_snr } : null,
		bandpass: bandpass ? { fields: [...bandpass.fields], interval: toRenderInterval(bandpass.interval), min_snr: bandpass.min_snr } : null,
		gain: gain
			? { fields: [...gain.fields], interval: toRenderInterval(gain.interval), solve_for: gain.solve_for, min_snr: gain.min_snr }
			: null,
		flux_bootstrap: bootstrap ? { fields: [...bootstrap.fields] } : null,
		apply: apply ? { fields: [...apply.fields] } : null,
		verify: verify
			? { fields: [...verify.fields], max_amplitude_scatter_pct: verify.max_amplitude_scatter_pct, max_phase_rms_deg: verify.max_phase_rms_deg }
			: null
	};
}

/** Builds the typed context a template reads, from a recipe version and its template's identity. */
export function buildRenderContext(input: RenderContextInput): RenderContext {
	const { recipe } = input;
	return {
		header: {
			title: recipe.title,
			recipe_id: input.recipeId,
			recipe_version: input.recipeVersion,
			template_name: input.templateName,
			template_version: input.templateVersion,
			params_sha256: paramsSha256(recipe)
		},
		p: {
			title: recipe.title,
			notes: recipe.notes,
			spectral_window_id: recipe.spectral_window_id,
			field_roles: toRecord(recipe.fields.map((field) => [field.name, [...field.roles]] as const)),
			targets: recipe.targets.map((t) => ({ field: t.field, gain_calibrator: t.gain_calibrator, interpolation: t.interpolation })),
			reference_antenna: recipe.reference_antenna.primary,
			reference_fallbacks: [...recipe.reference_antenna.fallbacks],
			clean_channels: recipe.clean_channels.map((r): [number, number] => [r.start, r.end]),
			excluded_channels: recipe.excluded_channels.map((r): [number, number] => [r.start, r.end]),
			flux_models: toRecord(recipe.flux_models.map((m) => [m.field, toRenderFluxModel(m.model)] as const)),
			steps: recipe.steps.map((step) => step.kind),
			...buildStepContext(recipe.steps)
		}
	};
}

import { z } from 'zod';
import type { ObservationSummary } from '$lib/calibration/observation-schema';
import { fieldRoleSchema, standardNameSchema, type FieldRole, type FluxModel, type RecipeParams, type SolutionInterval, type Step, type StepOf } from '$lib/calibration/recipe';
import { FLUX_STANDARDS, matchStandard } from '$lib/calibration/flux-standards';
import { findNearestField } from '$lib/calibration/suggest-roles';
import { computeStepFields, DEFAULT_MIN_SNR, DEFAULT_VERIFY, listFieldsWithRole } from '$lib/calibration/defaults';
import { formatRanges, parseRanges } from '$lib/components/recipe/channel-ranges';

// Flat form schemas, one per wizard screen: they post as ordinary HTML form fields (so the
// wizard works without JavaScript) and are read by superforms on both sides. `applyXForm`
// turns a screen's values into the next draft; `xFormValues` fills a screen from a draft.

export type FormIssue = { field: string; message: string };
export type FormResult = { ok: true; draft: RecipeParams } | { ok: false; issues: FormIssue[] };

const revision = z.number().int().min(1);
const intervalModes = ['integration', 'scan', 'seconds', 'observation'] as const;
const intervalMode = z.enum(intervalModes);

export const rolesFormSchema = z.object({
	revision,
	/** `${fieldIndex}:${role}` for every ticked box. */
	assignments: z.array(z.string()).default([]),
	/** `${targetIndex}:${calibratorIndex}` per target. */
	target_gcal: z.array(z.string()).default([]),
	/** `${targetIndex}:linear|nearest` per target. */
	target_interp: z.array(z.string()).default([])
});
export const fluxFormSchema = z.object({
	revision,
	model_field: z.array(z.string()).default([]),
	model_kind: z.array(z.enum(['standard', 'manual'])).default([]),
	model_standard: z.array(z.string()).default([]),
	model_flux_jy: z.array(z.string()).default([]),
	model_ref_freq_mhz: z.array(z.string()).default([]),
	model_alpha: z.array(z.string()).default([]),
	model_curvature: z.array(z.string()).default([]),
	estimate_field: z.array(z.string()).default([]),
	estimate_jy: z.array(z.string()).default([])
});
export const referenceFormSchema = z.object({
	revision,
	primary: z.string().min(1, 'Choose a reference antenna.'),
	fallbacks: z.array(z.string()).default([])
});
export const channelsFormSchema = z.object({ revision, clean: z.string().default(''), excluded: z.string().default('') });
export const solveFormSchema = z.object({
	revision,
	delay_enabled: z.boolean().default(false),
	delay_mode: intervalMode.default('scan'),
	delay_seconds: z.string().default(''),
	delay_min_snr: z.number().positive().default(DEFAULT_MIN_SNR.delay),
	delay_window_ns: z.number().positive().default(50),
	prep_mode: intervalMode.default('scan'),
	prep_seconds: z.string().default(''),
	prep_min_snr: z.number().positive().default(DEFAULT_MIN_SNR.bandpass_prep),
	bandpass_mode: intervalMode.default('scan'),
	bandpass_seconds: z.string().default(''),
	bandpass_min_snr: z.number().positive().default(DEFAULT_MIN_SNR.bandpass),
	bandpass_without_delay_reason: z.string().max(1000).default(''),
	gain_mode: intervalMode.default('scan'),
	gain_seconds: z.string().default(''),
	gain_solve_for: z.enum(['phase', 'amplitude_and_phase']).default('amplitude_and_phase'),
	gain_min_snr: z.number().positive().default(DEFAULT_MIN_SNR.gain_complex),
	verify_scatter_pct: z.number().positive().default(DEFAULT_VERIFY.max_amplitude_scatter_pct),
	verify_phase_deg: z.number().positive().default(DEFAULT_VERIFY.max_phase_rms_deg)
});
export const observationFormSchema = z.object({ revision, observation_id: z.uuid({ message: 'Choose one of the team\'s observations.' }) });
export const saveVersionFormSchema = z.object({ revision, message: z.string().trim().min(1, 'Say in a few words what this version changes.').max(500) });

export type RolesForm = z.infer<typeof rolesFormSchema>;
export type FluxForm = z.infer<typeof fluxFormSchema>;
export type ReferenceForm = z.infer<typeof referenceFormSchema>;
export type ChannelsForm = z.infer<typeof channelsFormSchema>;
export type SolveForm = z.infer<typeof solveFormSchema>;

/** Keeps the step list consistent with the roles: which fields each step works on. */
export function alignStepFields(draft: RecipeParams): RecipeParams {
	return { ...draft, steps: draft.steps.map((s) => ({ ...s, fields: computeStepFields(draft.fields, s.kind) }) as Step) };
}

// ---- roles -------------------------------------------------------------------------------

export function rolesFormValues(draft: RecipeParams, summary: ObservationSummary): Omit<RolesForm, 'revision'> {
	const index = new Map(summary.fields.map((f, i) => [f.name, i]));
	return {
		assignments: draft.fields.flatMap((f) => f.roles.map((r) => `${index.get(f.name) ?? -1}:${r}`)).filter((v) => !v.startsWith('-1:')),
		target_gcal: draft.targets.map((t) => `${index.get(t.field) ?? -1}:${index.get(t.gain_calibrator) ?? -1}`),
		target_interp: draft.targets.map((t) => `${index.get(t.field) ?? -1}:${t.interpolation}`)
	};
}

export function applyRolesForm(draft: RecipeParams, summary: ObservationSummary, form: Omit<RolesForm, 'revision'>): FormResult {
	const issues: FormIssue[] = [];
	const roles = new Map<number, Set<FieldRole>>();
	for (const a of form.assignments) {
		const [i, r] = a.split(':');
		const role = fieldRoleSchema.safeParse(r);
		const fi = Number(i);
		if (!role.success || !Number.isInteger(fi) || !summary.fields[fi]) {
			issues.push({ field: 'assignments', message: `Unknown field or role "${a}".` });
			continue;
		}
		const set = roles.get(fi) ?? new Set<FieldRole>();
		set.add(role.data);
		roles.set(fi, set);
	}
	const fields = summary.fields.flatMap((f, i) => {
		const set = roles.get(i);
		return set && set.size > 0 ? [{ name: f.name, roles: fieldRoleSchema.options.filter((r) => set.has(r)) }] : [];
	});
	const gainCals = listFieldsWithRole(fields, 'gain_calibrator');
	const picked = new Map<string, string>();
	for (const v of form.target_gcal) {
		const [t, g] = v.split(':').map(Number);
		const tf = summary.fields[t ?? -1];
		const gf = summary.fields[g ?? -1];
		if (tf && gf) picked.set(tf.name, gf.name);
	}
	const interp = new Map<string, 'linear' | 'nearest'>();
	for (const v of form.target_interp) {
		const [t, mode] = v.split(':');
		const tf = summary.fields[Number(t)];
		if (tf && (mode === 'linear' || mode === 'nearest')) interp.set(tf.name, mode);
	}
	const targets = listFieldsWithRole(fields, 'target').map((name) => {
		const chosen = picked.get(name);
		const gain_calibrator = chosen && gainCals.includes(chosen) ? chosen : (findNearestField(summary, name, gainCals)?.name ?? chosen ?? '');
		return { field: name, gain_calibrator, interpolation: interp.get(name) ?? 'linear' };
	});
	if (issues.length > 0) return { ok: false, issues };
	// New flux calibrators get the published standard they match, when there is one.
	const flux_models = listFieldsWithRole(fields, 'flux_calibrator').flatMap((name) => {
		const existing = draft.flux_models.find((m) => m.field === name);
		if (existing) return [existing];
		const f = summary.fields.find((x) => x.name === name);
		const match = f ? matchStandard(f.name, f.ra_deg, f.dec_deg) : null;
		return match ? [{ field: name, model: { kind: 'standard' as const, standard: match.standard } }] : [];
	});
	return { ok: true, draft: alignStepFields({ ...draft, fields, targets, flux_models, flux_estimates: draft.flux_estimates.filter((e) => fields.some((f) => f.name === e.field)) }) };
}

// ---- flux ----------------------------------------------------------------------------------

export function fluxFormValues(draft: RecipeParams): Omit<FluxForm, 'revision'> {
	const fluxCals = listFieldsWithRole(draft.fields, 'flux_calibrator');
	const models = fluxCals.map((name) => draft.flux_models.find((m) => m.field === name)?.model ?? null);
	const manual = (m: FluxModel | null) => (m && m.kind === 'manual' ? m : null);
	return {
		model_field: fluxCals,
		model_kind: models.map((m) => (m?.kind === 'manual' ? 'manual' : 'standard')),
		model_standard: models.map((m) => (m?.kind === 'standard' ? m.standard : '')),
		model_flux_jy: models.map((m) => String(manual(m)?.flux_jy ?? '')),
		model_ref_freq_mhz: models.map((m) => (manual(m) ? String((manual(m)?.ref_freq_hz ?? 0) / 1e6) : '')),
		model_alpha: models.map((m) => String(manual(m)?.spectral_index ?? '')),
		model_curvature: models.map((m) => String(manual(m)?.curvature ?? '')),
		estimate_field: listFieldsWithRole(draft.fields, 'gain_calibrator').filter((g) => !fluxCals.includes(g)),
		estimate_jy: listFieldsWithRole(draft.fields, 'gain_calibrator')
			.filter((g) => !fluxCals.includes(g))
			.map((g) => String(draft.flux_estimates.find((e) => e.field === g)?.flux_jy ?? ''))
	};
}

function readNumber(text: string | undefined, field: string, label: string, issues: FormIssue[], opts: { positive?: boolean; optional?: boolean } = {}): number | null {
	const t = (text ?? '').trim();
	if (t === '') {
		if (!opts.optional) issues.push({ field, message: `${label}: enter a number.` });
		return null;
	}
	const x = Number(t);
	if (!Number.isFinite(x) || (opts.positive && x <= 0)) {
		issues.push({ field, message: `${label}: "${t}" is not ${opts.positive ? 'a positive number' : 'a number'}.` });
		return null;
	}
	return x;
}

export function applyFluxForm(draft: RecipeParams, form: Omit<FluxForm, 'revision'>): FormResult {
	const issues: FormIssue[] = [];
	const flux_models: RecipeParams['flux_models'] = [];
	form.model_field.forEach((field, i) => {
		if (!draft.fields.some((f) => f.name === field && f.roles.includes('flux_calibrator'))) return;
		if (form.model_kind[i] === 'manual') {
			const flux = readNumber(form.model_flux_jy[i], 'model_flux_jy', `Flux density of ${field}`, issues, { positive: true });
			const ref = readNumber(form.model_ref_freq_mhz[i], 'model_ref_freq_mhz', `Reference frequency of ${field}`, issues, { positive: true });
			const alpha = readNumber(form.model_alpha[i], 'model_alpha', `Spectral index of ${field}`, issues, { optional: true });
			const curv = readNumber(form.model_curvature[i], 'model_curvature', `Curvature of ${field}`, issues, { optional: true });
			if (flux !== null && ref !== null) flux_models.push({ field, model: { kind: 'manual', flux_jy: flux, ref_freq_hz: ref * 1e6, spectral_index: alpha ?? 0, curvature: curv ?? 0 } });
		} else {
			const std = standardNameSchema.safeParse(form.model_standard[i]);
			if (!std.success) issues.push({ field: 'model_standard', message: `Choose a published standard for ${field}, or a manual model.` });
			else flux_models.push({ field, model: { kind: 'standard', standard: std.data } });
		}
	});
	const flux_estimates: RecipeParams['flux_estimates'] = [];
	form.estimate_field.forEach((field, i) => {
		const jy = readNumber(form.estimate_jy[i], 'estimate_jy', `Flux estimate of ${field}`, issues, { positive: true, optional: true });
		if (jy !== null) flux_estimates.push({ field, flux_jy: jy });
	});
	return issues.length > 0 ? { ok: false, issues } : { ok: true, draft: { ...draft, flux_models, flux_estimates } };
}

/** The standards offered in the flux step, with their citation. */
export const STANDARD_CHOICES = standardNameSchema.options.map((name) => ({ name, citation: FLUX_STANDARDS[name].citation }));

// ---- reference antenna ------------------------------------------------------------------------

export function referenceFormValues(draft: RecipeParams): Omit<ReferenceForm, 'revision'> {
	return { primary: draft.reference_antenna.primary, fallbacks: [...draft.reference_antenna.fallbacks] };
}

export function applyReferenceForm(draft: RecipeParams, form: Omit<ReferenceForm, 'revision'>): FormResult {
	const fallbacks = form.fallbacks.map((f) => f.trim()).filter((f) => f !== '');
	const seen = new Set<string>([form.primary]);
	for (const f of fallbacks) {
		if (seen.has(f)) return { ok: false, issues: [{ field: 'fallbacks', message: `${f} appears twice; each fallback must be a different antenna from the primary and the others.` }] };
		seen.add(f);
	}
	return { ok: true, draft: { ...draft, reference_antenna: { primary: form.primary, fallbacks } } };
}

// ---- channels ----------------------------------------------------------------------------------

export function channelsFormValues(draft: RecipeParams): Omit<ChannelsForm, 'revision'> {
	return { clean: formatRanges(draft.clean_channels), excluded: formatRanges(draft.excluded_channels) };
}

export function applyChannelsForm(draft: RecipeParams, nChan: number, form: Omit<ChannelsForm, 'revision'>): FormResult {
	const clean = parseRanges(form.clean, nChan);
	const excluded = parseRanges(form.excluded, nChan);
	const issues: FormIssue[] = [];
	if (!clean.ok) issues.push({ field: 'clean', message: `Clean channels: ${clean.error.message}` });
	if (!excluded.ok) issues.push({ field: 'excluded', message: `Excluded channels: ${excluded.error.message}` });
	if (!clean.ok || !excluded.ok) return { ok: false, issues };
	return { ok: true, draft: { ...draft, clean_channels: clean.value, excluded_channels: excluded.value } };
}

// ---- solve chain ----------------------------------------------------------------------------------

function intervalParts(i: SolutionInterval | undefined): { mode: (typeof intervalModes)[number]; seconds: string } {
	if (!i) return { mode: 'scan', seconds: '' };
	return i.mode === 'seconds' ? { mode: 'seconds', seconds: String(i.seconds) } : { mode: i.mode, seconds: '' };
}

function findStep<K extends Step['kind']>(draft: RecipeParams, kind: K): StepOf<K> | undefined {
	return draft.steps.find((s): s is StepOf<K> => s.kind === kind);
}

export function solveFormValues(draft: RecipeParams): Omit<SolveForm, 'revision'> {
	const delay = findStep(draft, 'delay');
	const prep = findStep(draft, 'bandpass_prep');
	const bp = findStep(draft, 'bandpass');
	const gain = findStep(draft, 'gain');
	const verify = findStep(draft, 'verify');
	const d = intervalParts(delay?.interval);
	const p = intervalParts(prep?.interval);
	const b = intervalParts(bp?.interval);
	const g = intervalParts(gain?.interval);
	return {
		delay_enabled: delay !== undefined,
		delay_mode: d.mode,
		delay_seconds: d.seconds,
		delay_min_snr: delay?.min_snr ?? DEFAULT_MIN_SNR.delay,
		delay_window_ns: delay?.search_window_ns ?? 50,
		prep_mode: p.mode,
		prep_seconds: p.seconds,
		prep_min_snr: prep?.min_snr ?? DEFAULT_MIN_SNR.bandpass_prep,
		bandpass_mode: b.mode,
		bandpass_seconds: b.seconds,
		bandpass_min_snr: bp?.min_snr ?? DEFAULT_MIN_SNR.bandpass,
		bandpass_without_delay_reason: bp?.without_delay_reason ?? '',
		gain_mode: g.mode,
		gain_seconds: g.seconds,
		gain_solve_for: gain?.solve_for ?? 'amplitude_and_phase',
		gain_min_snr: gain?.min_snr ?? DEFAULT_MIN_SNR.gain_complex,
		verify_scatter_pct: verify?.max_amplitude_scatter_pct ?? DEFAULT_VERIFY.max_amplitude_scatter_pct,
		verify_phase_deg: verify?.max_phase_rms_deg ?? DEFAULT_VERIFY.max_phase_rms_deg
	};
}

function readInterval(mode: (typeof intervalModes)[number], seconds: string, field: string, label: string, issues: FormIssue[]): SolutionInterval {
	if (mode !== 'seconds') return { mode };
	const s = readNumber(seconds, field, `${label} interval in seconds`, issues, { positive: true });
	return { mode: 'seconds', seconds: s ?? 1 };
}

export function applySolveForm(draft: RecipeParams, form: Omit<SolveForm, 'revision'>): FormResult {
	const issues: FormIssue[] = [];
	const delayInterval = readInterval(form.delay_mode, form.delay_seconds, 'delay_seconds', 'Delay', issues);
	const prepInterval = readInterval(form.prep_mode, form.prep_seconds, 'prep_seconds', 'Provisional phase', issues);
	const bpInterval = readInterval(form.bandpass_mode, form.bandpass_seconds, 'bandpass_seconds', 'Bandpass', issues);
	const gainInterval = readInterval(form.gain_mode, form.gain_seconds, 'gain_seconds', 'Gain', issues);
	if (issues.length > 0) return { ok: false, issues };
	const reason = form.bandpass_without_delay_reason.trim();
	const steps: Step[] = [];
	for (const s of draft.steps) {
		switch (s.kind) {
			case 'delay':
				if (form.delay_enabled) steps.push({ ...s, interval: delayInterval, min_snr: form.delay_min_snr, search_window_ns: form.delay_window_ns });
				break;
			case 'bandpass_prep':
				steps.push({ ...s, interval: prepInterval, min_snr: form.prep_min_snr });
				break;
			case 'bandpass': {
				const { without_delay_reason: _old, ...rest } = s;
				steps.push({ ...rest, interval: bpInterval, min_snr: form.bandpass_min_snr, ...(!form.delay_enabled && reason !== '' ? { without_delay_reason: reason } : {}) });
				break;
			}
			case 'gain':
				steps.push({ ...s, interval: gainInterval, solve_for: form.gain_solve_for, min_snr: form.gain_min_snr });
				break;
			case 'verify':
				steps.push({ ...s, max_amplitude_scatter_pct: form.verify_scatter_pct, max_phase_rms_deg: form.verify_phase_deg });
				break;
			default:
				steps.push(s);
		}
	}
	if (form.delay_enabled && !steps.some((s) => s.kind === 'delay')) {
		steps.unshift({ kind: 'delay', fields: [], interval: delayInterval, min_snr: form.delay_min_snr, search_window_ns: form.delay_window_ns });
	}
	return { ok: true, draft: alignStepFields({ ...draft, steps }) };
}

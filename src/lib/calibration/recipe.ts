import { z } from 'zod';
import { fieldRoleSchema } from './field-role';
import { observationSummarySchema, type ObservationSummary } from './observation-schema';
import { parseObservationValue } from './observation';
import { checkFormatHeader, parseJsonText } from './format-header';
import { convertZodIssues } from './issues';
import { makeErr, makeOk, type InputIssue, type Result } from './result';

export { fieldRoleSchema, type FieldRole } from './field-role';

/** The required order of step kinds (DESIGN.md "Steps"; METHODS.md §13). */
export const STEP_ORDER = ['delay', 'bandpass_prep', 'bandpass', 'gain', 'flux_bootstrap', 'apply', 'verify'] as const;
export type StepKind = (typeof STEP_ORDER)[number];

export const solutionIntervalSchema = z.discriminatedUnion('mode', [
	z.strictObject({ mode: z.literal('integration') }),
	z.strictObject({ mode: z.literal('scan') }),
	z.strictObject({ mode: z.literal('seconds'), seconds: z.number().positive() }),
	z.strictObject({ mode: z.literal('observation') })
]);
export type SolutionInterval = z.infer<typeof solutionIntervalSchema>;

/** Inclusive channel indices of one spectral window. */
export const channelRangeSchema = z.strictObject({ start: z.int().min(0), end: z.int().min(0) });
export type ChannelRange = z.infer<typeof channelRangeSchema>;

export const standardNameSchema = z.enum(['3C48', '3C123', '3C138', '3C147', '3C196', '3C286', '3C295', 'PKS B1934-638']);
export type StandardName = z.infer<typeof standardNameSchema>;

/** manual: log10 S = log10 flux_jy + spectral_index·x + curvature·x², x = log10(ν / ref_freq_hz). */
export const fluxModelSchema = z.discriminatedUnion('kind', [
	z.strictObject({ kind: z.literal('standard'), standard: standardNameSchema }),
	z.strictObject({
		kind: z.literal('manual'),
		flux_jy: z.number().positive(),
		ref_freq_hz: z.number().positive(),
		spectral_index: z.number(),
		curvature: z.number().default(0)
	})
]);
export type FluxModel = z.infer<typeof fluxModelSchema>;

// Lone UTF-16 surrogates cannot be encoded as UTF-8: a program printing such a name would
// crash, so user text must be well-formed.
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;
const text = (min: number, max: number) =>
	z.string().min(min).max(max).refine((v) => !LONE_SURROGATE.test(v), { message: 'contains an unpaired UTF-16 surrogate; use well-formed Unicode text' });
const fieldName = text(1, 200);
const fieldList = z.array(fieldName).max(1000);
const minSnr = z.number().positive();

export const stepSchema = z.discriminatedUnion('kind', [
	z.strictObject({ kind: z.literal('delay'), fields: fieldList, interval: solutionIntervalSchema, min_snr: minSnr, search_window_ns: z.number().positive() }),
	z.strictObject({ kind: z.literal('bandpass_prep'), fields: fieldList, interval: solutionIntervalSchema, solve_for: z.literal('phase'), min_snr: minSnr }),
	z.strictObject({
		kind: z.literal('bandpass'),
		fields: fieldList,
		interval: solutionIntervalSchema,
		min_snr: minSnr,
		without_delay_reason: text(1, 1000).optional()
	}),
	z.strictObject({
		kind: z.literal('gain'),
		fields: fieldList,
		interval: solutionIntervalSchema,
		solve_for: z.enum(['phase', 'amplitude_and_phase']),
		min_snr: minSnr
	}),
	z.strictObject({ kind: z.literal('flux_bootstrap'), fields: fieldList }),
	z.strictObject({ kind: z.literal('apply'), fields: fieldList }),
	z.strictObject({
		kind: z.literal('verify'),
		fields: fieldList,
		max_amplitude_scatter_pct: z.number().positive(),
		max_phase_rms_deg: z.number().positive()
	})
]);
export type Step = z.infer<typeof stepSchema>;
export type StepOf<K extends StepKind> = Extract<Step, { kind: K }>;

/** The recipe parameters: the agreed contract between helpers (snake_case keys: it is a file format). */
export const recipeParamsSchema = z.strictObject({
	schema_version: z.literal(1),
	title: text(1, 200),
	notes: text(0, 5000).default(''),
	spectral_window_id: z.int().min(0),
	fields: z.array(z.strictObject({ name: fieldName, roles: z.array(fieldRoleSchema).max(5) })).max(1000),
	flux_models: z.array(z.strictObject({ field: fieldName, model: fluxModelSchema })).max(1000),
	flux_estimates: z.array(z.strictObject({ field: fieldName, flux_jy: z.number().positive() })).max(1000),
	targets: z
		.array(z.strictObject({ field: fieldName, gain_calibrator: fieldName, interpolation: z.enum(['linear', 'nearest']) }))
		.max(1000),
	reference_antenna: z.strictObject({ primary: text(1, 200), fallbacks: z.array(text(1, 200)).max(16) }),
	clean_channels: z.array(channelRangeSchema).max(256),
	excluded_channels: z.array(channelRangeSchema).max(4096),
	steps: z.array(stepSchema).max(32)
});
export type RecipeParams = z.infer<typeof recipeParamsSchema>;
/** What a caller may hand in before defaults (notes, curvature) are filled. */
export type RecipeParamsInput = z.input<typeof recipeParamsSchema>;

/** `phasewright.recipe` v1: a recipe with its embedded observation, for export and import. */
export const recipeExportSchema = z.strictObject({
	format: z.literal('phasewright.recipe'),
	format_version: z.literal(1),
	title: z.string().min(1).max(200),
	observation: observationSummarySchema,
	recipe: recipeParamsSchema,
	template: z.strictObject({ name: z.string().min(1).max(200), version: z.int().min(1) })
});
export type RecipeExport = z.infer<typeof recipeExportSchema>;

export const RECIPE_EXPORT_FORMAT = 'phasewright.recipe';
export const RECIPE_EXPORT_VERSION = 1;
const RECIPE_EXPORT_MAX_BYTES = 6_000_000;

/** Validate an already-parsed value as recipe parameters. */
export function parseRecipeParamsValue(value: unknown): Result<RecipeParams, { issues: InputIssue[] }> {
	const parsed = recipeParamsSchema.safeParse(value, { reportInput: true });
	if (!parsed.success) return makeErr({ issues: convertZodIssues(parsed.error.issues) });
	return makeOk(parsed.data);
}

/** Parse a `phasewright.recipe` export from text; rejects other formats and newer versions with a clear message. */
export function parseRecipeExport(text: string): Result<RecipeExport, { issues: InputIssue[] }> {
	const json = parseJsonText(text, { maxBytes: RECIPE_EXPORT_MAX_BYTES, maxDepth: 24 });
	if (!json.ok) return makeErr({ issues: [json.issue] });
	return parseRecipeExportValue(json.value);
}

/** Like `parseRecipeExport`, for a value already read from JSON. */
export function parseRecipeExportValue(value: unknown): Result<RecipeExport, { issues: InputIssue[] }> {
	const header = checkFormatHeader(value, RECIPE_EXPORT_FORMAT, RECIPE_EXPORT_VERSION);
	if (header) return makeErr({ issues: [header] });
	const parsed = recipeExportSchema.safeParse(value, { reportInput: true });
	if (!parsed.success) return makeErr({ issues: convertZodIssues(parsed.error.issues) });
	// The embedded observation gets the same cross-checks as an uploaded one.
	const observation = parseObservationValue(parsed.data.observation);
	if (!observation.ok) {
		return makeErr({ issues: observation.error.issues.map((i) => ({ ...i, path: i.path.replace(/^\$/, '$.observation') })) });
	}
	return makeOk(parsed.data);
}

/** Build an export document (the caller serialises it). */
export function createRecipeExport(input: {
	title: string;
	observation: ObservationSummary;
	recipe: RecipeParams;
	template: { name: string; version: number };
}): RecipeExport {
	return { format: RECIPE_EXPORT_FORMAT, format_version: RECIPE_EXPORT_VERSION, ...input };
}

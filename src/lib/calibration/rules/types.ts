import { z } from 'zod';
import type { ObservationSummary, ObservationField, Scan, SpectralWindow } from '../observation-schema';
import type { FieldRole } from '../field-role';
import type { RecipeParams, Step, StepKind } from '../recipe';

export type Severity = 'error' | 'warning' | 'note';

/** One result of validation (DESIGN.md "Finding"). */
export type Finding = {
	code: string;
	severity: Severity;
	/** The offending parameter, e.g. `steps[2].interval`. */
	path: string;
	message: string;
	why: string;
	source: string;
	/** Present when a team policy changed the rule's default severity. */
	policy?: { from: Severity; to: Severity };
};

/** What a rule reports; the registry adds code, severity and source. */
export type RuleHit = { path: string; message: string; why?: string };

/** Facts derived once per validation and shared by the rules. */
export type RuleContext = {
	recipe: RecipeParams;
	observation: ObservationSummary | null;
	/** The recipe's window in the observation, when both exist. */
	spw: SpectralWindow | null;
	rolesByField: ReadonlyMap<string, ReadonlySet<FieldRole>>;
	fieldsByName: ReadonlyMap<string, ObservationField>;
	/** Scans of each field (by name) that include the recipe's window, with durations in seconds. */
	scansByField: ReadonlyMap<string, readonly { scan: Scan; durationS: number }[]>;
	stepsByKind: ReadonlyMap<StepKind, readonly { step: Step; index: number }[]>;
};

export type Rule = {
	code: string;
	severity: Severity;
	/** Published reference, or "common practice" / "project choice". */
	source: string;
	/** General explanation; a hit may give a more specific one. */
	why: string;
	/** Locked rules guard what the program needs to run at all; a team policy cannot change them. */
	locked?: boolean;
	check: (ctx: RuleContext) => RuleHit[];
};

/** A team's rule policy: severity overrides by rule code. */
export const rulePolicySchema = z.strictObject({
	overrides: z.record(z.string().min(1).max(100), z.enum(['error', 'warning', 'note', 'off']))
});
export type RulePolicy = z.infer<typeof rulePolicySchema>;

import type { ObservationSummary } from './observation-schema';
import type { RecipeParams } from './recipe';
import { buildRuleContext } from './rules/context';
import { estimateSolveSnr, type SnrEstimate, type SolveKind } from './rules/snr-model';

const SOLVE_KINDS: ReadonlySet<string> = new Set<SolveKind>(['delay', 'bandpass_prep', 'bandpass', 'gain']);

export type StepSnr = { stepIndex: number; kind: SolveKind; field: string; estimate: SnrEstimate };

/**
 * The expected SNR of every solve step on each of its fields at the step's interval, with the
 * shortest interval that reaches the step's minimum (the same model the SNR rule uses).
 */
export function estimateStepSnrs(recipe: RecipeParams, observation: ObservationSummary | null): StepSnr[] {
	const ctx = buildRuleContext(recipe, observation);
	const out: StepSnr[] = [];
	recipe.steps.forEach((step, stepIndex) => {
		if (!SOLVE_KINDS.has(step.kind) || !('interval' in step) || !('min_snr' in step)) return;
		const kind = step.kind as SolveKind;
		for (const field of step.fields) out.push({ stepIndex, kind, field, estimate: estimateSolveSnr(ctx, kind, field, step.interval, step.min_snr) });
	});
	return out;
}

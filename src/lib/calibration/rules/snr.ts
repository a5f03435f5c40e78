import { describeEstimate, estimateSolveSnr, formatNumber, type SolveKind } from './snr-model';
import type { Rule, RuleContext, RuleHit } from './types';

const SOURCE = 'Wrobel & Walker 1999 (radiometer equation, METHODS.md §9)';
const SOLVES: SolveKind[] = ['delay', 'bandpass_prep', 'bandpass', 'gain'];

type Evaluated = { index: number; kind: SolveKind; field: string; estimate: ReturnType<typeof estimateSolveSnr>; minSnr: number };

function evaluateSolves(ctx: RuleContext): Evaluated[] {
	const out: Evaluated[] = [];
	for (const kind of SOLVES) {
		for (const { step, index } of ctx.stepsByKind.get(kind) ?? []) {
			if (step.kind !== kind || !('interval' in step)) continue;
			for (const field of step.fields) {
				out.push({ index, kind, field, minSnr: step.min_snr, estimate: estimateSolveSnr(ctx, kind, field, step.interval, step.min_snr) });
			}
		}
	}
	return out;
}

export const snrBelowMinimum: Rule = {
	code: 'snr.below_minimum',
	severity: 'warning',
	source: SOURCE,
	why: 'A solution below its SNR threshold is noisy (phase error ≈ 1/SNR rad) and is flagged by the program, losing the data it would have corrected. Thresholds: phase-only 3, complex 5, amplitude-critical (bandpass, bootstrap) 10, delay 5.',
	check(ctx) {
		const hits: RuleHit[] = [];
		for (const { index, kind, field, estimate: e, minSnr } of evaluateSolves(ctx)) {
			if (!e.ok || e.snr >= minSnr || !e.plan.feasible) continue;
			const per = kind === 'bandpass' ? ' per channel' : '';
			hits.push({
				path: `steps[${index}].interval`,
				message: `expected SNR${per} on "${field}" ≈ ${formatNumber(e.snr)} over ${formatNumber(e.timeS)} s, below ${minSnr}; ${formatNumber(e.plan.solutionS)} s (${formatNumber(e.plan.solutionS / (ctx.observation?.integration_s ?? 1))} integrations) would reach it. Inputs: ${describeEstimate(e)}`
			});
		}
		return hits;
	}
};

export const snrInfeasible: Rule = {
	code: 'snr.infeasible',
	severity: 'error',
	source: SOURCE,
	why: 'Even one solution per whole scan cannot reach the SNR asked: use a brighter calibrator, more bandwidth, a lower threshold, or combine scans.',
	check(ctx) {
		return evaluateSolves(ctx).flatMap(({ index, kind, field, estimate: e, minSnr }) => {
			if (!e.ok || e.snr >= minSnr || e.plan.feasible) return [];
			const per = kind === 'bandpass' ? ' per channel' : '';
			return [
				{
					path: `steps[${index}].min_snr`,
					message: `expected SNR${per} on "${field}" ≈ ${formatNumber(e.snr)}, below ${minSnr}; reaching it needs ${formatNumber(e.plan.minimumS)} s, longer than its longest scan (${formatNumber(e.longestScanS)} s). Inputs: ${describeEstimate(e)}`
				}
			];
		});
	}
};

export const snrFluxUnknown: Rule = {
	code: 'snr.flux_unknown',
	severity: 'note',
	source: SOURCE,
	why: 'The SNR check needs the calibrator\'s flux density: a flux model, or an estimate in flux_estimates (used for planning only).',
	check(ctx) {
		const seen = new Set<string>();
		return evaluateSolves(ctx)
			.filter(({ estimate, field }) => !estimate.ok && estimate.reason === 'no_flux' && !seen.has(field) && seen.add(field))
			.map(({ field }) => ({ path: 'flux_estimates', message: `no flux model or estimate for "${field}", so the SNR of its solutions cannot be checked` }));
	}
};

export const snrArrayUnknown: Rule = {
	code: 'snr.sensitivity_unknown',
	severity: 'note',
	source: SOURCE,
	why: 'The radiometer equation needs the array\'s SEFD (and correlator efficiency); the observation summary can carry both.',
	check(ctx) {
		const obs = ctx.observation;
		if (!obs) return [];
		const hits: RuleHit[] = [];
		if (obs.array.sefd_jy === undefined) hits.push({ path: 'steps', message: 'the observation gives no sefd_jy, so no SNR is checked' });
		else if (obs.array.correlator_efficiency === undefined) {
			hits.push({ path: 'steps', message: 'the observation gives no correlator_efficiency; SNR estimates assume 0.88 (2-bit quantisation)' });
		}
		return hits;
	}
};

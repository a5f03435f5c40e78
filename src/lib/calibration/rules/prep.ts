import { getScanSpan } from './context';
import { describeEstimate, estimateSolveSnr, formatNumber } from './snr-model';
import type { Rule, RuleHit } from './types';
import type { StepOf } from '../recipe';

const PREP_WHY =
	'By default the provisional phase solve uses one solution per bandpass-calibrator scan or longer: it secures SNR on the calibrator and aligns the phases of several bandpass scans before one bandpass solve combines them (common practice). Its limit: one phase per antenna per scan is a constant inside that scan, which the complex bandpass solve would absorb anyway, so it does not remove phase wander within the scan; where SNR allows, a shorter interval also removes that decorrelation (a Gaussian phase jitter of rms σ scales the averaged amplitude by e^(−σ²/2): 10° → 0.985, 30° → 0.872). A team policy may relax this rule to a warning to allow the shorter interval.';

function describeSnrTradeOff(ctx: Parameters<Rule['check']>[0], step: StepOf<'bandpass_prep'>, field: string): string {
	const atScan = estimateSolveSnr(ctx, 'bandpass_prep', field, { mode: 'scan' }, step.min_snr);
	if (!atScan.ok) return '';
	const { plan } = atScan;
	const atShortest = plan.feasible
		? `the shortest interval meeting the phase-only threshold of ${step.min_snr} is ${formatNumber(plan.solutionS)} s (SNR ≈ ${formatNumber(plan.snrAtSolution)})`
		: `no interval within the scan reaches the threshold of ${step.min_snr}`;
	const oneInt = estimateSolveSnr(ctx, 'bandpass_prep', field, { mode: 'integration' }, step.min_snr);
	const perInt = oneInt.ok ? ` and ≈ ${formatNumber(oneInt.snr)} per integration` : '';
	return ` For "${field}": expected SNR per antenna ≈ ${formatNumber(atScan.snr)} at the scan length (${formatNumber(atScan.timeS)} s)${perInt}; ${atShortest}. Inputs: ${describeEstimate(atScan)}.`;
}

export const prepIntervalShorterThanScan: Rule = {
	code: 'prep.interval_shorter_than_scan',
	severity: 'error',
	source: 'common practice (calibration training; METHODS.md §5)',
	why: PREP_WHY,
	check(ctx) {
		const hits: RuleHit[] = [];
		for (const { step, index } of ctx.stepsByKind.get('bandpass_prep') ?? []) {
			if (step.kind !== 'bandpass_prep') continue;
			const { interval } = step;
			if (interval.mode === 'scan' || interval.mode === 'observation') continue;
			const bpFields = step.fields;
			const longest = Math.max(0, ...bpFields.map((f) => getScanSpan(ctx, f)?.longest ?? 0));
			const seconds = interval.mode === 'seconds' ? interval.seconds : (ctx.observation?.integration_s ?? 0);
			// Without an observation, only "integration" is known to be shorter than any scan.
			if (ctx.observation ? seconds >= longest : interval.mode === 'seconds') continue;
			const what = interval.mode === 'integration' ? 'one integration' : `${formatNumber(seconds)} s`;
			const scanText = ctx.observation ? `the longest bandpass-calibrator scan (${formatNumber(longest)} s)` : 'a scan';
			hits.push({
				path: `steps[${index}].interval`,
				message: `the provisional phase interval (${what}) is shorter than ${scanText}; use "scan" or at least ${formatNumber(longest)} s`,
				why: PREP_WHY + bpFields.map((f) => describeSnrTradeOff(ctx, step, f)).join('')
			});
		}
		return hits;
	}
};

export const prepNoCleanChannels: Rule = {
	code: 'prep.no_clean_channels',
	severity: 'error',
	locked: true,
	source: 'common practice (METHODS.md §5)',
	why: 'The provisional phase solve runs on clean channels near the band centre, where the uncorrected bandpass phase is nearly constant; without any it has no data.',
	check(ctx) {
		const prep = ctx.stepsByKind.get('bandpass_prep')?.[0];
		if (!prep || ctx.recipe.clean_channels.length > 0) return [];
		return [{ path: 'clean_channels', message: 'the bandpass_prep step needs clean channels; add a block of interference-free channels near the band centre (a few to ~10 % of the band)' }];
	}
};

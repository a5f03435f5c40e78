import type { SolutionInterval } from '../recipe';
import { getScanSpan } from './context';
import { formatNumber } from './snr-model';
import type { Rule, RuleHit } from './types';

export const intervalShorterThanIntegration: Rule = {
	code: 'interval.shorter_than_integration',
	severity: 'error',
	source: 'project choice',
	why: 'The data come in whole integrations; a shorter solution interval holds no complete sample.',
	check(ctx) {
		const tInt = ctx.observation?.integration_s;
		if (tInt === undefined) return [];
		const hits: RuleHit[] = [];
		ctx.recipe.steps.forEach((step, i) => {
			const interval = 'interval' in step ? (step.interval as SolutionInterval) : null;
			if (interval?.mode === 'seconds' && interval.seconds < tInt) {
				hits.push({ path: `steps[${i}].interval.seconds`, message: `${interval.seconds} s is shorter than one integration (${tInt} s)` });
			}
		});
		return hits;
	}
};

export const gainIntervalSpansScans: Rule = {
	code: 'interval.gain_longer_than_scan',
	severity: 'warning',
	source: 'common practice (METHODS.md §6)',
	why: 'A gain interval longer than the calibrator scan averages solutions across scans, hiding the gain changes in between that the target needs.',
	check(ctx) {
		const g = ctx.stepsByKind.get('gain')?.[0];
		if (!g || g.step.kind !== 'gain') return [];
		const interval = g.step.interval;
		if (interval.mode !== 'seconds' && interval.mode !== 'observation') return [];
		const hits: RuleHit[] = [];
		for (const f of g.step.fields) {
			const span = getScanSpan(ctx, f);
			if (!span) continue;
			if (interval.mode === 'observation' || interval.seconds > span.longest) {
				const what = interval.mode === 'observation' ? 'one solution for the whole observation' : `${interval.seconds} s`;
				hits.push({ path: `steps[${g.index}].interval`, message: `${what} is longer than the scans of "${f}" (longest ${formatNumber(span.longest)} s), so it averages across scans` });
			}
		}
		return hits;
	}
};

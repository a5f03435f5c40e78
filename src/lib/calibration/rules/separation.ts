import { angularSeparationDeg } from '../geometry';
import type { Rule, RuleHit } from './types';

export const MAX_GAIN_SEPARATION_DEG = 15;

export const gainCalibratorFar: Rule = {
	code: 'gain.calibrator_far_from_target',
	severity: 'warning',
	source: 'common practice (METHODS.md §10)',
	why: `Gains transfer well only through similar atmosphere and ionosphere: keep the gain calibrator within ~${MAX_GAIN_SEPARATION_DEG}° of its target, closer at high frequency or on long baselines.`,
	check(ctx) {
		const hits: RuleHit[] = [];
		ctx.recipe.targets.forEach((t, i) => {
			const a = ctx.fieldsByName.get(t.field);
			const b = ctx.fieldsByName.get(t.gain_calibrator);
			if (!a || !b) return;
			const sep = angularSeparationDeg(a.ra_deg, a.dec_deg, b.ra_deg, b.dec_deg);
			if (sep > MAX_GAIN_SEPARATION_DEG) {
				hits.push({ path: `targets[${i}].gain_calibrator`, message: `"${t.gain_calibrator}" is ${sep.toFixed(1)}° from target "${t.field}" (more than ~${MAX_GAIN_SEPARATION_DEG}°)` });
			}
		});
		return hits;
	}
};

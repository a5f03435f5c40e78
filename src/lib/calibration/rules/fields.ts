import type { FieldRole } from '../field-role';
import type { StepKind } from '../recipe';
import { hasRole } from './context';
import type { Rule, RuleContext, RuleHit } from './types';

/** Every place a recipe names a field, with its path. */
function listFieldReferences(ctx: RuleContext): { name: string; path: string }[] {
	const r = ctx.recipe;
	return [
		...r.fields.map((f, i) => ({ name: f.name, path: `fields[${i}].name` })),
		...r.flux_models.map((m, i) => ({ name: m.field, path: `flux_models[${i}].field` })),
		...r.flux_estimates.map((e, i) => ({ name: e.field, path: `flux_estimates[${i}].field` })),
		...r.targets.flatMap((t, i) => [
			{ name: t.field, path: `targets[${i}].field` },
			{ name: t.gain_calibrator, path: `targets[${i}].gain_calibrator` }
		]),
		...r.steps.flatMap((s, i) => s.fields.map((name, j) => ({ name, path: `steps[${i}].fields[${j}]` })))
	];
}

export const unknownField: Rule = {
	code: 'fields.unknown',
	severity: 'error',
	locked: true,
	source: 'project choice',
	why: 'Fields are referred to by name; a name that the observation (or, without one, the recipe\'s fields list) does not contain selects no data.',
	check(ctx) {
		const known = ctx.observation ? new Set(ctx.fieldsByName.keys()) : new Set(ctx.recipe.fields.map((f) => f.name));
		const where = ctx.observation ? 'the observation' : 'the recipe\'s fields list';
		return listFieldReferences(ctx)
			.filter((ref) => !known.has(ref.name))
			.filter((ref) => ctx.observation !== null || !ref.path.startsWith('fields['))
			.map((ref) => ({ path: ref.path, message: `no field named ${JSON.stringify(ref.name)} in ${where}` }));
	}
};

export const unknownSpectralWindow: Rule = {
	code: 'spw.unknown',
	severity: 'error',
	locked: true,
	source: 'project choice',
	why: 'The recipe calibrates one spectral window of the observation.',
	check(ctx) {
		if (!ctx.observation || ctx.spw) return [];
		const ids = ctx.observation.spectral_windows.map((w) => w.id).join(', ');
		return [{ path: 'spectral_window_id', message: `no spectral window ${ctx.recipe.spectral_window_id} in the observation (it has ${ids})` }];
	}
};

const STEP_ROLES: Partial<Record<StepKind, readonly FieldRole[]>> = {
	delay: ['delay_calibrator', 'bandpass_calibrator'],
	bandpass_prep: ['bandpass_calibrator'],
	bandpass: ['bandpass_calibrator'],
	gain: ['flux_calibrator', 'gain_calibrator'],
	flux_bootstrap: ['gain_calibrator'],
	verify: ['flux_calibrator', 'bandpass_calibrator', 'gain_calibrator', 'delay_calibrator']
};

export const stepRoleMismatch: Rule = {
	code: 'steps.role_mismatch',
	severity: 'warning',
	source: 'common practice (METHODS.md §13)',
	why: 'Each solve belongs on calibrators of the matching role; solving on a target assumes it is a point source of known flux.',
	check(ctx) {
		const hits: RuleHit[] = [];
		ctx.recipe.steps.forEach((step, i) => {
			const roles = STEP_ROLES[step.kind];
			if (!roles) return;
			step.fields.forEach((f, j) => {
				if (ctx.rolesByField.has(f) && !roles.some((r) => hasRole(ctx, f, r))) {
					hits.push({ path: `steps[${i}].fields[${j}]`, message: `"${f}" has none of the roles a ${step.kind} step expects (${roles.join(', ')})` });
				}
			});
		});
		return hits;
	}
};

export const applyMissingTarget: Rule = {
	code: 'coverage.apply_missing_target',
	severity: 'error',
	source: 'project choice',
	why: 'Every target must be corrected by the apply step, or the program leaves its data uncalibrated.',
	check(ctx) {
		const apply = ctx.stepsByKind.get('apply')?.[0];
		const applied = new Set(apply?.step.fields ?? []);
		const path = apply ? `steps[${apply.index}].fields` : 'steps';
		return ctx.recipe.fields
			.filter((f) => f.roles.includes('target') && !applied.has(f.name))
			.map((f) => ({ path, message: apply ? `target "${f.name}" is not in the apply step` : `no apply step, so target "${f.name}" is never corrected` }));
	}
};

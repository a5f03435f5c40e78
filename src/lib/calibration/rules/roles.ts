import { CALIBRATOR_ROLES } from '../field-role';
import { hasRole, listFieldsWithRole } from './context';
import type { Rule, RuleHit } from './types';

export const noFluxCalibrator: Rule = {
	code: 'roles.no_flux_calibrator',
	severity: 'error',
	source: 'common practice (METHODS.md §7)',
	why: 'The flux-density scale comes from a calibrator of known flux density; without one the amplitudes stay in correlator units.',
	check(ctx) {
		return listFieldsWithRole(ctx, 'flux_calibrator').length > 0 ? [] : [{ path: 'fields', message: 'no field has the flux_calibrator role' }];
	}
};

export const noFluxModel: Rule = {
	code: 'roles.no_flux_model',
	severity: 'error',
	source: 'Perley & Butler 2017; Reynolds 1994 (METHODS.md §8)',
	why: 'A flux calibrator is solved against its model S(ν); choose a published standard or enter a manual model.',
	check(ctx) {
		const modelled = new Set(ctx.recipe.flux_models.map((m) => m.field));
		return ctx.recipe.fields.flatMap((f, i) =>
			f.roles.includes('flux_calibrator') && !modelled.has(f.name) ? [{ path: `fields[${i}]`, message: `flux calibrator "${f.name}" has no flux model in flux_models` }] : []
		);
	}
};

export const noBandpassCalibrator: Rule = {
	code: 'roles.no_bandpass_calibrator',
	severity: 'error',
	source: 'common practice (METHODS.md §4)',
	why: 'The bandpass is solved on a bright calibrator; without one the spectral response stays uncorrected.',
	check(ctx) {
		return listFieldsWithRole(ctx, 'bandpass_calibrator').length > 0 ? [] : [{ path: 'fields', message: 'no field has the bandpass_calibrator role' }];
	}
};

export const targetWithoutGainCalibrator: Rule = {
	code: 'roles.target_without_gain_calibrator',
	severity: 'error',
	locked: true,
	source: 'common practice (METHODS.md §6)',
	why: 'Each target takes its time-variable gains from a gain calibrator observed around it.',
	check(ctx) {
		const hits: RuleHit[] = [];
		const listed = new Map(ctx.recipe.targets.map((t, i) => [t.field, i]));
		ctx.recipe.fields.forEach((f, i) => {
			if (f.roles.includes('target') && !listed.has(f.name)) hits.push({ path: `fields[${i}]`, message: `target "${f.name}" has no entry in targets (which gain calibrator it uses)` });
		});
		ctx.recipe.targets.forEach((t, i) => {
			if (!hasRole(ctx, t.field, 'target')) hits.push({ path: `targets[${i}].field`, message: `"${t.field}" is listed in targets but does not have the target role` });
			if (!hasRole(ctx, t.gain_calibrator, 'gain_calibrator')) {
				hits.push({ path: `targets[${i}].gain_calibrator`, message: `"${t.gain_calibrator}" does not have the gain_calibrator role` });
			}
		});
		const seen = new Set<string>();
		ctx.recipe.targets.forEach((t, i) => {
			if (seen.has(t.field)) hits.push({ path: `targets[${i}].field`, message: `"${t.field}" is listed in targets twice` });
			seen.add(t.field);
		});
		return hits;
	}
};

export const targetAndCalibrator: Rule = {
	code: 'roles.target_and_calibrator',
	severity: 'error',
	source: 'common practice',
	why: 'Solving gains on a target and applying them to it would calibrate it against an assumed point-source model and erase its real structure.',
	check(ctx) {
		return ctx.recipe.fields.flatMap((f, i) =>
			f.roles.includes('target') && f.roles.some((r) => CALIBRATOR_ROLES.includes(r))
				? [{ path: `fields[${i}].roles`, message: `"${f.name}" is both a target and a calibrator (${f.roles.join(', ')})` }]
				: []
		);
	}
};

export const duplicateField: Rule = {
	code: 'roles.duplicate_field',
	severity: 'error',
	locked: true,
	source: 'project choice',
	why: 'Each field appears once in fields, with all its roles.',
	check(ctx) {
		const seen = new Set<string>();
		const hits: RuleHit[] = [];
		ctx.recipe.fields.forEach((f, i) => {
			if (seen.has(f.name)) hits.push({ path: `fields[${i}].name`, message: `"${f.name}" is listed twice; merge its roles into one entry` });
			seen.add(f.name);
		});
		return hits;
	}
};

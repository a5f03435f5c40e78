import { FLUX_STANDARDS, matchStandard } from '../flux-standards';
import { getFreqSpanHz } from '../spectral-window';
import type { Rule, RuleHit } from './types';

export const MAX_ABS_SPECTRAL_INDEX = 5;

export const fluxModelExtrapolated: Rule = {
	code: 'flux.extrapolated',
	severity: 'warning',
	source: 'Perley & Butler 2017; Reynolds 1994 (METHODS.md §8)',
	why: 'A flux-standard polynomial is only fitted over its stated frequency range; outside it the model is an extrapolation of unknown accuracy.',
	check(ctx) {
		if (!ctx.spw) return [];
		const [lo, hi] = getFreqSpanHz(ctx.spw);
		const hits: RuleHit[] = [];
		ctx.recipe.flux_models.forEach((m, i) => {
			if (m.model.kind !== 'standard') return;
			const std = FLUX_STANDARDS[m.model.standard];
			if (lo < std.valid_min_hz || hi > std.valid_max_hz) {
				hits.push({
					path: `flux_models[${i}].model`,
					message: `the window spans ${(lo / 1e9).toFixed(4)}–${(hi / 1e9).toFixed(4)} GHz but the ${std.name} model is fitted over ${std.valid_min_hz / 1e9}–${std.valid_max_hz / 1e9} GHz (${std.citation})`
				});
			}
		});
		return hits;
	}
};

export const fluxModelImplausible: Rule = {
	code: 'flux.manual_implausible',
	severity: 'warning',
	source: 'common practice',
	why: `Radio continuum spectral indices lie within a few units of zero; |α| ≥ ${MAX_ABS_SPECTRAL_INDEX} (or as large a curvature) is almost certainly a typing slip.`,
	check(ctx) {
		const hits: RuleHit[] = [];
		ctx.recipe.flux_models.forEach((m, i) => {
			if (m.model.kind !== 'manual') return;
			if (Math.abs(m.model.spectral_index) >= MAX_ABS_SPECTRAL_INDEX) {
				hits.push({ path: `flux_models[${i}].model.spectral_index`, message: `spectral index ${m.model.spectral_index} is implausible (|α| ≥ ${MAX_ABS_SPECTRAL_INDEX})` });
			}
			if (Math.abs(m.model.curvature) >= MAX_ABS_SPECTRAL_INDEX) {
				hits.push({ path: `flux_models[${i}].model.curvature`, message: `curvature ${m.model.curvature} is implausible` });
			}
		});
		return hits;
	}
};

export const fluxModelWrongSource: Rule = {
	code: 'flux.standard_mismatch',
	severity: 'warning',
	source: 'Perley & Butler 2017; Reynolds 1994 (METHODS.md §8)',
	why: 'A standard model describes one particular source; applied to another field it sets a wrong flux scale.',
	check(ctx) {
		const hits: RuleHit[] = [];
		ctx.recipe.flux_models.forEach((m, i) => {
			if (m.model.kind !== 'standard') return;
			const f = ctx.fieldsByName.get(m.field);
			if (!f) return;
			const match = matchStandard(f.name, f.ra_deg, f.dec_deg);
			if (match?.standard === m.model.standard) return;
			hits.push({
				path: `flux_models[${i}].model.standard`,
				message: match
					? `"${m.field}" looks like ${match.standard} (${match.reason}), not ${m.model.standard}`
					: `"${m.field}" matches neither the name nor the position (within 1 arcmin) of ${m.model.standard}`
			});
		});
		return hits;
	}
};

import { isAntennaInScan, listFieldsWithRole } from './context';
import { CALIBRATOR_ROLES } from '../field-role';
import type { Rule, RuleHit } from './types';

const SOURCE = 'project choice (METHODS.md §11)';

export const referenceUnknown: Rule = {
	code: 'refant.unknown',
	severity: 'error',
	locked: true,
	source: SOURCE,
	why: 'Phases are referred to the reference antenna; it must be one of the array\'s antennas.',
	check(ctx) {
		if (!ctx.observation) return [];
		const names = new Set(ctx.observation.array.antennas.map((a) => a.name));
		const primary = ctx.recipe.reference_antenna.primary;
		return names.has(primary) ? [] : [{ path: 'reference_antenna.primary', message: `no antenna named ${JSON.stringify(primary)} in the array` }];
	}
};

export const referenceNotInCalibratorScans: Rule = {
	code: 'refant.not_in_calibrator_scans',
	severity: 'error',
	source: SOURCE,
	why: 'The reference antenna must have data in every calibrator scan, or solutions in those scans fall back to another antenna and their phases jump.',
	check(ctx) {
		const obs = ctx.observation;
		const primary = ctx.recipe.reference_antenna.primary;
		if (!obs || !obs.array.antennas.some((a) => a.name === primary)) return [];
		if (obs.flagged_antennas.includes(primary)) {
			return [{ path: 'reference_antenna.primary', message: `"${primary}" is in the observation's flagged_antennas` }];
		}
		const calibrators = new Set(CALIBRATOR_ROLES.flatMap((r) => listFieldsWithRole(ctx, r)));
		const missing = [...calibrators].flatMap((f) => (ctx.scansByField.get(f) ?? []).filter((s) => !isAntennaInScan(ctx, primary, s.scan)).map((s) => s.scan.id));
		return missing.length === 0 ? [] : [{ path: 'reference_antenna.primary', message: `"${primary}" has no data in calibrator scan(s) ${missing.join(', ')}` }];
	}
};

export const referenceFallbackInvalid: Rule = {
	code: 'refant.fallback_invalid',
	severity: 'error',
	source: SOURCE,
	why: 'Fallbacks are tried in order when the reference antenna has no data; each must be a different antenna of the array.',
	check(ctx) {
		const hits: RuleHit[] = [];
		const { primary, fallbacks } = ctx.recipe.reference_antenna;
		const names = ctx.observation ? new Set(ctx.observation.array.antennas.map((a) => a.name)) : null;
		const seen = new Set<string>();
		fallbacks.forEach((f, i) => {
			const path = `reference_antenna.fallbacks[${i}]`;
			if (f === primary) hits.push({ path, message: `"${f}" is the primary reference antenna itself` });
			else if (seen.has(f)) hits.push({ path, message: `"${f}" is listed twice` });
			else if (names && !names.has(f)) hits.push({ path, message: `no antenna named ${JSON.stringify(f)} in the array` });
			seen.add(f);
		});
		return hits;
	}
};

export const referenceFallbackFlagged: Rule = {
	code: 'refant.fallback_flagged',
	severity: 'warning',
	source: SOURCE,
	why: 'A flagged antenna can never stand in for the reference antenna.',
	check(ctx) {
		const flagged = new Set(ctx.observation?.flagged_antennas ?? []);
		return ctx.recipe.reference_antenna.fallbacks.flatMap((f, i) =>
			flagged.has(f) ? [{ path: `reference_antenna.fallbacks[${i}]`, message: `"${f}" is in the observation's flagged_antennas` }] : []
		);
	}
};

import { angularSeparationDeg } from './geometry';
import { matchStandard } from './flux-standards';
import type { FieldRole } from './field-role';
import type { ObservationSummary } from './observation-schema';
import { scanStatistics } from './observation';
import type { StandardName } from './recipe';

export type FieldSuggestion = { name: string; roles: FieldRole[]; reason: string; standard: StandardName | null };
export type TargetSuggestion = { field: string; gain_calibrator: string; separation_deg: number; reason: string };
export type RoleSuggestion = { fields: FieldSuggestion[]; targets: TargetSuggestion[] };

const STANDARD_ROLES: FieldRole[] = ['flux_calibrator', 'bandpass_calibrator', 'delay_calibrator'];

/** The field among `among` nearest on the sky to field `name` (by name), with the separation in degrees. */
export function findNearestField(summary: ObservationSummary, name: string, among: Iterable<string>): { name: string; sep: number } | null {
	const a = summary.fields.find((f) => f.name === name);
	let best: { name: string; sep: number } | null = null;
	for (const other of among) {
		const b = summary.fields.find((f) => f.name === other);
		if (!a || !b || other === name) continue;
		const sep = angularSeparationDeg(a.ra_deg, a.dec_deg, b.ra_deg, b.dec_deg);
		if (!best || sep < best.sep) best = { name: other, sep };
	}
	return best;
}

/**
 * Suggest field roles: the observation's intents when present; else a recognised flux standard becomes the
 * flux, bandpass and delay calibrator; among the other fields, those observed in short scans (median at most half
 * the longest field median; common practice: calibrator scans are brief and frequent) are calibrator candidates,
 * the nearest candidate to each target becomes its gain calibrator, and everything else is a target.
 */
export function suggestRoles(summary: ObservationSummary): RoleSuggestion {
	const stats = new Map(scanStatistics(summary).map((s) => [s.field_id, s]));
	const fields: FieldSuggestion[] = summary.fields.map((f) => {
		const match = matchStandard(f.name, f.ra_deg, f.dec_deg);
		if (f.intents && f.intents.length > 0) {
			return { name: f.name, roles: [...new Set(f.intents)], reason: 'from the intents recorded in the observation', standard: match?.standard ?? null };
		}
		if (match) return { name: f.name, roles: [...STANDARD_ROLES], reason: match.reason, standard: match.standard };
		return { name: f.name, roles: [], reason: '', standard: null };
	});

	const open = summary.fields.filter((_, i) => (fields[i]?.roles.length ?? 0) === 0);
	const medians = open.map((f) => stats.get(f.id)?.median_s ?? 0);
	const longest = Math.max(0, ...medians);
	const candidates = new Set(open.filter((f, i) => (stats.get(f.id)?.count ?? 0) >= 2 && (medians[i] ?? 0) <= longest / 2).map((f) => f.name));

	const gainCalibrators = (): string[] => fields.filter((f) => f.roles.includes('gain_calibrator')).map((f) => f.name);
	const findNearest = (name: string, among: Iterable<string>) => findNearestField(summary, name, among);

	// Fields left open that are not calibrator candidates are targets; each picks its nearest candidate.
	const chosen = new Set<string>();
	for (const f of fields) {
		if (f.roles.length > 0 || candidates.has(f.name)) continue;
		f.roles = ['target'];
		f.reason = 'no intents; observed in long scans, so taken for a target';
		const nearest = findNearest(f.name, candidates);
		if (nearest) chosen.add(nearest.name);
	}
	for (const f of fields) {
		if (f.roles.length > 0) continue;
		if (chosen.has(f.name)) {
			f.roles = ['gain_calibrator'];
			f.reason = 'no intents; observed in short, repeated scans and the nearest such field to a target';
		} else {
			f.roles = ['target'];
			f.reason = 'no intents; short scans but not the nearest calibrator candidate to any target';
		}
	}

	const calibrators = gainCalibrators();
	const targets: TargetSuggestion[] = [];
	for (const f of fields) {
		if (!f.roles.includes('target')) continue;
		const nearest = findNearest(f.name, calibrators);
		if (nearest) {
			targets.push({
				field: f.name,
				gain_calibrator: nearest.name,
				separation_deg: nearest.sep,
				reason: `nearest gain calibrator, ${nearest.sep.toFixed(1)}° away`
			});
		}
	}
	return { fields, targets };
}

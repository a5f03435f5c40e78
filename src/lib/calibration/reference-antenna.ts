import { computeMedian } from './observation';
import type { ObservationSummary } from './observation-schema';

/*
 * Reference-antenna ranking (METHODS.md §11, project choice): eligible when present and ≥ 90 % unflagged in
 * every calibrator scan; score s = f − 0.5·d / max_eligible(d), with f the unflagged fraction over all calibrator
 * data and d the distance from the array centre (per-coordinate median). Highest score first; ties → lower index.
 */

export const MIN_SCAN_FRACTION = 0.9;

export type ReferenceCandidate = {
	name: string;
	east_m: number;
	north_m: number;
	up_m: number;
	/** Unflagged fraction over all calibrator data, 0..1. */
	unflaggedFraction: number;
	/** Smallest unflagged fraction in any one calibrator scan (0 when absent from a scan). */
	minScanFraction: number;
};

export type RankedAntenna = {
	name: string;
	index: number;
	eligible: boolean;
	unflaggedFraction: number;
	distanceM: number;
	/** null for ineligible antennas. */
	score: number | null;
	reason: string;
};

function computeCentre(candidates: readonly ReferenceCandidate[]): [number, number, number] {
	const median = (values: number[]) => computeMedian(values.sort((a, b) => a - b)) ?? 0;
	return [
		median(candidates.map((c) => c.east_m)),
		median(candidates.map((c) => c.north_m)),
		median(candidates.map((c) => c.up_m))
	];
}

/** Rank candidates best first, each with the reason for its place. */
export function rankReferenceAntennas(candidates: readonly ReferenceCandidate[]): RankedAntenna[] {
	const [e0, n0, u0] = computeCentre(candidates);
	const distances = candidates.map((c) => Math.hypot(c.east_m - e0, c.north_m - n0, c.up_m - u0));
	const eligible = candidates.map((c) => c.minScanFraction >= MIN_SCAN_FRACTION);
	const maxDistance = Math.max(0, ...distances.filter((_, i) => eligible[i]));
	const ranked = candidates.map((c, index): RankedAntenna => {
		const distanceM = distances[index] ?? 0;
		const fractionText = `${(100 * c.unflaggedFraction).toFixed(1)} % unflagged`;
		const distanceText = `${distanceM.toFixed(0)} m from the array centre`;
		if (!eligible[index]) {
			const why = c.minScanFraction <= 0 ? 'absent from a calibrator scan' : `only ${(100 * c.minScanFraction).toFixed(1)} % unflagged in one calibrator scan`;
			return { name: c.name, index, eligible: false, unflaggedFraction: c.unflaggedFraction, distanceM, score: null, reason: `not eligible: ${why} (needs ≥ 90 % in every calibrator scan)` };
		}
		const score = c.unflaggedFraction - (maxDistance > 0 ? (0.5 * distanceM) / maxDistance : 0);
		return { name: c.name, index, eligible: true, unflaggedFraction: c.unflaggedFraction, distanceM, score, reason: `${fractionText}, ${distanceText}, score ${score.toFixed(4)}` };
	});
	return ranked.sort((a, b) => {
		if (a.score === null || b.score === null) return a.score === null ? (b.score === null ? a.index - b.index : 1) : -1;
		return b.score - a.score || a.index - b.index;
	});
}

/**
 * Candidates from a summary. Summary v1 has no per-scan antenna lists, so an antenna counts as present in every
 * calibrator scan unless it is in `flagged_antennas`; a later per-scan list would fill the fractions here.
 */
export function listReferenceCandidates(summary: ObservationSummary): ReferenceCandidate[] {
	const flagged = new Set(summary.flagged_antennas);
	return summary.array.antennas.map((a) => {
		const fraction = flagged.has(a.name) ? 0 : 1;
		return { name: a.name, east_m: a.east_m, north_m: a.north_m, up_m: a.up_m, unflaggedFraction: fraction, minScanFraction: fraction };
	});
}

/** Rank the antennas of a summary. */
export function rankSummaryAntennas(summary: ObservationSummary): RankedAntenna[] {
	return rankReferenceAntennas(listReferenceCandidates(summary));
}

import type { Finding, Severity } from '../../calibration/rules/types';

// What validation says differently about two versions. Findings are matched by rule code and
// parameter path; a rule may report the same path more than once, so repeats pair in order.

export type SeverityChange = { before: Finding; after: Finding; from: Severity; to: Severity };
export type FindingsDiff = {
	/** In the newer version only. */
	appeared: Finding[];
	/** In the older version only. */
	disappeared: Finding[];
	/** In both, with a different severity (e.g. a team policy re-graded the rule). */
	severityChanged: SeverityChange[];
	/** In both with the same severity. */
	unchanged: number;
};

function keyOf(finding: Finding): string {
	return `${finding.code}\u0000${finding.path}`;
}

/** Compare the findings of an older and a newer version. */
export function diffFindings(before: readonly Finding[], after: readonly Finding[]): FindingsDiff {
	const pending = new Map<string, number[]>();
	before.forEach((finding, index) => {
		const key = keyOf(finding);
		const list = pending.get(key);
		if (list) list.push(index);
		else pending.set(key, [index]);
	});
	const result: FindingsDiff = { appeared: [], disappeared: [], severityChanged: [], unchanged: 0 };
	for (const finding of after) {
		const index = pending.get(keyOf(finding))?.shift();
		const match = index === undefined ? undefined : before[index];
		if (!match) result.appeared.push(finding);
		else if (match.severity !== finding.severity) result.severityChanged.push({ before: match, after: finding, from: match.severity, to: finding.severity });
		else result.unchanged++;
	}
	// Keep the older version's order for what went away.
	const left = new Set([...pending.values()].flat());
	result.disappeared = before.filter((_, index) => left.has(index));
	return result;
}

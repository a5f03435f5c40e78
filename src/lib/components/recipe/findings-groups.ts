import type { StepKind } from '$lib/calibration/recipe';
import type { Finding, Severity } from '$lib/calibration/validate';

/** Step titles for headings (the measurement-equation letter where there is one). */
export const STEP_HEADINGS: Readonly<Record<StepKind, string>> = {
	delay: 'Delay solve (K)',
	bandpass_prep: 'Provisional phase solve',
	bandpass: 'Bandpass solve (B)',
	gain: 'Complex gain solve (G)',
	flux_bootstrap: 'Flux bootstrap',
	apply: 'Apply solutions',
	verify: 'Verify calibrators'
};

export const SEVERITY_ORDER: readonly Severity[] = ['error', 'warning', 'note'];
export const SEVERITY_LABELS: Readonly<Record<Severity, string>> = { error: 'Error', warning: 'Warning', note: 'Note' };

export type FindingGroup = {
	/** `fields`, `channels`, `reference`, `step:<index>`, `general`. */
	key: string;
	title: string;
	findings: Finding[];
	counts: Record<Severity, number>;
};

const FIELD_KEYS = new Set(['fields', 'targets', 'flux_models', 'flux_estimates']);
const CHANNEL_KEYS = new Set(['clean_channels', 'excluded_channels', 'spectral_window_id']);

/** Which group a finding's path belongs to (paths look like `steps[2].interval`, optionally with a leading `$.`). */
export function classifyFindingPath(path: string): { kind: 'fields' | 'channels' | 'reference' | 'general' } | { kind: 'step'; index: number } {
	const bare = path.replace(/^\$\.?/, '');
	const step = /^steps\[(\d+)\]/.exec(bare);
	if (step) return { kind: 'step', index: Number(step[1]) };
	const head = /^[A-Za-z_]+/.exec(bare)?.[0] ?? '';
	if (FIELD_KEYS.has(head)) return { kind: 'fields' };
	if (CHANNEL_KEYS.has(head)) return { kind: 'channels' };
	if (head === 'reference_antenna') return { kind: 'reference' };
	return { kind: 'general' };
}

function countSeverities(findings: readonly Finding[]): Record<Severity, number> {
	const counts: Record<Severity, number> = { error: 0, warning: 0, note: 0 };
	for (const f of findings) counts[f.severity]++;
	return counts;
}

/**
 * Group findings as the wizard reads: fields and roles, channels, reference antenna, then each step in recipe
 * order (titled by its kind from `steps`), then general. Inside a group errors come first, then warnings, notes.
 */
export function groupFindings(findings: readonly Finding[], steps: readonly { kind: StepKind }[]): FindingGroup[] {
	const buckets = new Map<string, { title: string; order: number; findings: Finding[] }>();
	const put = (key: string, title: string, order: number, f: Finding) => {
		const bucket = buckets.get(key) ?? { title, order, findings: [] };
		bucket.findings.push(f);
		buckets.set(key, bucket);
	};
	for (const f of findings) {
		const group = classifyFindingPath(f.path);
		if (group.kind === 'fields') put('fields', 'Fields and roles', 0, f);
		else if (group.kind === 'channels') put('channels', 'Channels', 1, f);
		else if (group.kind === 'reference') put('reference', 'Reference antenna', 2, f);
		else if (group.kind === 'step') {
			const kind = steps[group.index]?.kind;
			const title = kind ? `Step ${group.index + 1}: ${STEP_HEADINGS[kind]}` : `Step ${group.index + 1}`;
			put(`step:${group.index}`, title, 3 + group.index, f);
		} else put('general', 'General', Number.MAX_SAFE_INTEGER, f);
	}
	return [...buckets.entries()]
		.sort((a, b) => a[1].order - b[1].order)
		.map(([key, b]) => {
			// Array.prototype.sort is stable, so findings of one severity keep the validator's order.
			const sorted = [...b.findings].sort((x, y) => SEVERITY_ORDER.indexOf(x.severity) - SEVERITY_ORDER.indexOf(y.severity));
			return { key, title: b.title, findings: sorted, counts: countSeverities(sorted) };
		});
}

/** Totals over all findings, for the summary line. */
export function countFindings(findings: readonly Finding[]): Record<Severity, number> {
	return countSeverities(findings);
}

/** "2 errors, 1 warning, no notes". */
export function describeCounts(counts: Record<Severity, number>): string {
	const part = (n: number, one: string) => (n === 0 ? `no ${one}s` : `${n} ${one}${n === 1 ? '' : 's'}`);
	return [part(counts.error, 'error'), part(counts.warning, 'warning'), part(counts.note, 'note')].join(', ');
}

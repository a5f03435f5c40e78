import { observationSummarySchema, OBSERVATION_LIMITS, type ObservationSummary, type Scan } from './observation-schema';
import { checkFormatHeader, parseJsonText } from './format-header';
import { convertZodIssues } from './issues';
import { makeErr, makeOk, type InputIssue, type Result } from './result';

export { observationSummarySchema, OBSERVATION_LIMITS, type ObservationSummary } from './observation-schema';

export const OBSERVATION_FORMAT = 'phasewright.observation';
export const OBSERVATION_VERSION = 1;

export type ParsedObservation = { summary: ObservationSummary; warnings: InputIssue[] };
export type ObservationError = { issues: InputIssue[] };

/** Parse a `phasewright.observation` v1 summary from JSON text (size, depth, schema and cross-checks). */
export function parseObservation(text: string): Result<ParsedObservation, ObservationError> {
	const json = parseJsonText(text, OBSERVATION_LIMITS);
	if (!json.ok) return makeErr({ issues: [json.issue] });
	return parseObservationValue(json.value);
}

/** Like `parseObservation`, for a value already read from JSON. */
export function parseObservationValue(value: unknown): Result<ParsedObservation, ObservationError> {
	const header = checkFormatHeader(value, OBSERVATION_FORMAT, OBSERVATION_VERSION);
	if (header) return makeErr({ issues: [header] });
	const parsed = observationSummarySchema.safeParse(value, { reportInput: true });
	if (!parsed.success) return makeErr({ issues: convertZodIssues(parsed.error.issues) });
	const summary = parsed.data;
	const issues = crossCheckSummary(summary);
	if (issues.length > 0) return makeErr({ issues });
	return makeOk({ summary, warnings: listSummaryWarnings(summary) });
}

function reportDuplicates<T>(
	items: readonly T[],
	keyOf: (item: T) => string | number,
	pathOf: (index: number) => string,
	what: string
): InputIssue[] {
	const seen = new Map<string | number, number>();
	const issues: InputIssue[] = [];
	items.forEach((item, index) => {
		const key = keyOf(item);
		const first = seen.get(key);
		if (first === undefined) seen.set(key, index);
		else issues.push({ path: pathOf(index), message: `expected a unique ${what}, found ${JSON.stringify(key)} again (first at index ${first})` });
	});
	return issues;
}

/** Consistency checks the schema cannot express; each issue says where and what. */
function crossCheckSummary(s: ObservationSummary): InputIssue[] {
	const issues: InputIssue[] = [
		...reportDuplicates(s.array.antennas, (a) => a.name, (i) => `$.array.antennas[${i}].name`, 'antenna name'),
		...reportDuplicates(s.spectral_windows, (w) => w.id, (i) => `$.spectral_windows[${i}].id`, 'spectral window id'),
		...reportDuplicates(s.fields, (f) => f.id, (i) => `$.fields[${i}].id`, 'field id'),
		...reportDuplicates(s.fields, (f) => f.name, (i) => `$.fields[${i}].name`, 'field name'),
		...reportDuplicates(s.scans, (c) => c.id, (i) => `$.scans[${i}].id`, 'scan id'),
		...reportDuplicates(s.correlations, (c) => c, (i) => `$.correlations[${i}]`, 'correlation')
	];
	const fieldIds = new Set(s.fields.map((f) => f.id));
	const spwIds = new Set(s.spectral_windows.map((w) => w.id));
	s.scans.forEach((scan, i) => {
		if (!fieldIds.has(scan.field_id)) {
			issues.push({ path: `$.scans[${i}].field_id`, message: `expected the id of a field in $.fields (${listIds(fieldIds)}), found ${scan.field_id}` });
		}
		scan.spw_ids.forEach((id, j) => {
			if (!spwIds.has(id)) {
				issues.push({ path: `$.scans[${i}].spw_ids[${j}]`, message: `expected the id of a spectral window in $.spectral_windows (${listIds(spwIds)}), found ${id}` });
			}
		});
		issues.push(...reportDuplicates(scan.spw_ids, (id) => id, (j) => `$.scans[${i}].spw_ids[${j}]`, 'spectral window id in the scan'));
		if (scanDurationS(scan) <= 0) {
			issues.push({ path: `$.scans[${i}].end_utc`, message: `expected a time after start_utc (${scan.start_utc}), found ${scan.end_utc}` });
		}
	});
	const antennaNames = new Set(s.array.antennas.map((a) => a.name));
	s.flagged_antennas.forEach((name, i) => {
		if (!antennaNames.has(name)) {
			issues.push({ path: `$.flagged_antennas[${i}]`, message: `expected the name of an antenna in $.array.antennas, found ${JSON.stringify(name)}` });
		}
	});
	return issues;
}

function listIds(ids: ReadonlySet<number>): string {
	const list = [...ids].sort((a, b) => a - b);
	return list.length > 8 ? `${list.slice(0, 8).join(', ')}, …` : list.join(', ');
}

/** Legal but suspicious content, reported without rejecting the summary. */
function listSummaryWarnings(s: ObservationSummary): InputIssue[] {
	const warnings: InputIssue[] = [];
	const unflagged = s.array.antennas.length - new Set(s.flagged_antennas).size;
	if (unflagged < 3) {
		// Gains are only determinable with at least 3 antennas (IRAM Interferometry School 2002, via METHODS.md §3).
		warnings.push({ path: '$.array.antennas', message: `only ${unflagged} unflagged antenna(s): antenna gains need at least 3` });
	}
	const observed = new Set(s.scans.map((c) => c.field_id));
	s.fields.forEach((f, i) => {
		if (!observed.has(f.id)) warnings.push({ path: `$.fields[${i}]`, message: `field ${JSON.stringify(f.name)} has no scans` });
	});
	return warnings;
}

/** Length of a scan in seconds. */
export function scanDurationS(scan: Scan): number {
	return (Date.parse(scan.end_utc) - Date.parse(scan.start_utc)) / 1000;
}

export type FieldScanStatistics = {
	field_id: number;
	field_name: string;
	count: number;
	total_s: number;
	min_s: number | null;
	median_s: number | null;
	max_s: number | null;
};

/** Per-field scan count and total / min / median / max duration in seconds, in the order of `fields`. */
export function scanStatistics(summary: ObservationSummary): FieldScanStatistics[] {
	const durations = new Map<number, number[]>();
	for (const scan of summary.scans) {
		const list = durations.get(scan.field_id) ?? [];
		list.push(scanDurationS(scan));
		durations.set(scan.field_id, list);
	}
	return summary.fields.map((field) => {
		const list = (durations.get(field.id) ?? []).sort((a, b) => a - b);
		const total = list.reduce((sum, d) => sum + d, 0);
		return {
			field_id: field.id,
			field_name: field.name,
			count: list.length,
			total_s: total,
			min_s: list[0] ?? null,
			median_s: computeMedian(list),
			max_s: list[list.length - 1] ?? null
		};
	});
}

/** Median of an ascending list; null when empty. */
export function computeMedian(sorted: readonly number[]): number | null {
	const n = sorted.length;
	if (n === 0) return null;
	const hi = sorted[Math.floor(n / 2)] ?? 0;
	if (n % 2 === 1) return hi;
	const lo = sorted[n / 2 - 1] ?? 0;
	return (lo + hi) / 2;
}

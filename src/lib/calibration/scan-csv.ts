import Papa from 'papaparse';
import { parseObservationValue, type ObservationError, type ParsedObservation } from './observation';
import { makeErr, type InputIssue, type Result } from './result';

/*
 * Build an observation summary from a scan list in CSV plus the rest of the summary as JSON (array, windows,
 * fields…), for observatories whose tools export scans as a table. CSV header (any column order):
 *   scan_id, field, start_utc, end_utc, spw_ids
 * `field` is a field name (or a numeric field id); `spw_ids` lists window ids separated by spaces or semicolons.
 */

const COLUMNS = ['scan_id', 'field', 'start_utc', 'end_utc', 'spw_ids'] as const;
const MAX_CSV_BYTES = 5_000_000;

function toLine(rowIndex: number): string {
	return `scans CSV line ${rowIndex + 2}`; // +1 for the header, +1 for 1-based lines
}

/** Parse a scan CSV and merge it into `rest` (a summary without `scans`); issues name CSV lines and columns. */
export function parseScanCsv(csvText: string, rest: unknown): Result<ParsedObservation, ObservationError> {
	if (csvText.length > MAX_CSV_BYTES) return makeErr({ issues: [{ path: 'scans CSV', message: `the file is larger than the limit of ${MAX_CSV_BYTES / 1e6} MB` }] });
	if (typeof rest !== 'object' || rest === null || Array.isArray(rest)) {
		return makeErr({ issues: [{ path: '$', message: 'expected the summary JSON (everything but scans) as an object' }] });
	}
	const parsed = Papa.parse<Record<string, string>>(csvText.trim(), { header: true, skipEmptyLines: true, transformHeader: (h) => h.trim().toLowerCase() });
	const issues: InputIssue[] = parsed.errors.map((e) => ({ path: e.row === undefined ? 'scans CSV' : toLine(e.row), message: e.message }));
	const header = parsed.meta.fields ?? [];
	for (const col of COLUMNS) {
		if (!header.includes(col)) issues.push({ path: 'scans CSV header', message: `expected a column "${col}", found columns ${header.map((h) => JSON.stringify(h)).join(', ') || 'none'}` });
	}
	if (issues.length > 0) return makeErr({ issues });

	const fields = (rest as { fields?: unknown }).fields;
	const idByName = new Map<string, number>();
	if (Array.isArray(fields)) {
		for (const f of fields as { name?: unknown; id?: unknown }[]) if (typeof f.name === 'string' && typeof f.id === 'number') idByName.set(f.name, f.id);
	}
	const scans = parsed.data.map((row, i) => {
		const fieldText = (row.field ?? '').trim();
		let fieldId: unknown = idByName.get(fieldText);
		if (fieldId === undefined) {
			if (/^\d+$/.test(fieldText)) fieldId = Number(fieldText);
			else issues.push({ path: `${toLine(i)}, column field`, message: `expected a field name from the summary's fields, found ${JSON.stringify(fieldText)}` });
		}
		const spwText = (row.spw_ids ?? '').trim();
		const spwIds = spwText.split(/[\s;]+/).filter((s) => s.length > 0).map((s) => (/^\d+$/.test(s) ? Number(s) : s));
		const idText = (row.scan_id ?? '').trim();
		return {
			id: /^\d+$/.test(idText) ? Number(idText) : idText,
			field_id: fieldId ?? -1,
			start_utc: (row.start_utc ?? '').trim(),
			end_utc: (row.end_utc ?? '').trim(),
			spw_ids: spwIds
		};
	});
	if (issues.length > 0) return makeErr({ issues });
	const result = parseObservationValue({ ...rest, scans });
	if (result.ok) return result;
	// Point scan problems at their CSV line rather than a JSON path the user never wrote.
	return makeErr({
		issues: result.error.issues.map((issue) => {
			const m = /^\$\.scans\[(\d+)\](?:\.([a-z_]+))?/.exec(issue.path);
			if (!m) return issue;
			const column = m[2] === 'id' ? 'scan_id' : m[2] === 'field_id' ? 'field' : m[2];
			return { path: `${toLine(Number(m[1]))}${column ? `, column ${column}` : ''}`, message: issue.message };
		})
	});
}

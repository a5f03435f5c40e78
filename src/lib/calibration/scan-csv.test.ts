import { describe, expect, it } from 'vitest';
import { createDemoObservation } from './demo-observation';
import { parseScanCsv } from './scan-csv';

function splitDemo() {
	const demo = createDemoObservation();
	const { scans, ...rest } = demo;
	const names = new Map(demo.fields.map((f) => [f.id, f.name]));
	const csv = ['scan_id,field,start_utc,end_utc,spw_ids', ...scans.map((s) => `${s.id},${names.get(s.field_id)},${s.start_utc},${s.end_utc},${s.spw_ids.join(' ')}`)].join('\n');
	return { demo, rest, csv };
}

describe('parseScanCsv', () => {
	it('rebuilds the demo summary from its scan table', () => {
		const { demo, rest, csv } = splitDemo();
		const result = parseScanCsv(csv, rest);
		expect(result.ok).toBe(true);
		if (result.ok) expect(result.value.summary).toEqual(demo);
	});

	it('accepts numeric field ids, extra spaces and semicolon-separated windows', () => {
		const { rest } = splitDemo();
		const csv = 'Scan_ID , field, start_utc, end_utc, spw_ids\n1, 0, 2026-03-14T20:00:00Z, 2026-03-14T20:10:00Z, 0;\n';
		const result = parseScanCsv(csv, rest);
		expect(result.ok).toBe(true);
		if (result.ok) expect(result.value.summary.scans).toEqual([{ id: 1, field_id: 0, start_utc: '2026-03-14T20:00:00Z', end_utc: '2026-03-14T20:10:00Z', spw_ids: [0] }]);
	});

	it('names the CSV line and column of a problem', () => {
		const { rest } = splitDemo();
		const csv = [
			'scan_id,field,start_utc,end_utc,spw_ids',
			'1,3C286,2026-03-14T20:00:00Z,2026-03-14T20:10:00Z,0',
			'2,3C286,2026-03-14T20:20:00Z,2026-03-14T20:15:00Z,0',
			'3,Nowhere,2026-03-14T20:30:00Z,2026-03-14T20:35:00Z,0'
		].join('\n');
		const bad = parseScanCsv(csv, rest);
		expect(bad.ok).toBe(false);
		if (!bad.ok) expect(bad.error.issues).toEqual([{ path: 'scans CSV line 4, column field', message: 'expected a field name from the summary\'s fields, found "Nowhere"' }]);
		const reversed = parseScanCsv(csv.split('\n').slice(0, 3).join('\n'), rest);
		expect(reversed.ok).toBe(false);
		if (!reversed.ok) expect(reversed.error.issues[0]?.path).toBe('scans CSV line 3, column end_utc');
	});

	it('reports a missing column', () => {
		const { rest } = splitDemo();
		const result = parseScanCsv('scan_id,field,start_utc,end_utc\n1,3C286,a,b', rest);
		expect(result.ok).toBe(false);
		if (!result.ok) expect(result.error.issues[0]?.message).toMatch(/expected a column "spw_ids"/);
	});
});

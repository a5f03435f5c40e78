import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseObservation, parseObservationValue, scanStatistics } from './observation';
import { createDemoObservation } from './demo-observation';

const readFixture = (name: string) => readFileSync(new URL(`../../../tests/fixtures/observations/${name}`, import.meta.url), 'utf8');

function expectIssues(text: string): { path: string; message: string }[] {
	const result = parseObservation(text);
	expect(result.ok).toBe(false);
	return result.ok ? [] : result.error.issues;
}

describe('parseObservation', () => {
	it('accepts the demo summary, and the fixture file equals the exported demo', () => {
		const result = parseObservation(readFixture('demo.json'));
		expect(result.ok).toBe(true);
		if (result.ok) {
			expect(result.value.summary).toEqual(createDemoObservation());
			expect(result.value.warnings).toEqual([]);
		}
	});

	it('rejects another format and a newer version with one clear message', () => {
		const wrong = expectIssues(readFixture('wrong-format.json'));
		expect(wrong).toHaveLength(1);
		expect(wrong[0]?.path).toBe('$.format');
		expect(wrong[0]?.message).toMatch(/expected "phasewright\.observation", found the text "someone-else\.observation"/);
		const newer = expectIssues(readFixture('newer-version.json'));
		expect(newer).toHaveLength(1);
		expect(newer[0]?.path).toBe('$.format_version');
		expect(newer[0]?.message).toMatch(/version 2, newer than the version this Phasewright reads \(1\)/);
	});

	it('reports bad JSON without throwing', () => {
		const issues = expectIssues(readFixture('truncated.json'));
		expect(issues[0]?.message).toMatch(/expected valid JSON/);
		expect(expectIssues('[1, 2]')[0]?.message).toMatch(/expected a JSON object/);
	});

	it('enforces the size and depth limits', () => {
		expect(expectIssues(' '.repeat(5_000_001))[0]?.message).toMatch(/larger than the limit of 5 MB/);
		expect(expectIssues('['.repeat(40) + ']'.repeat(40))[0]?.message).toMatch(/nested at most 16 levels/);
	});

	it('gives precise paths and expected/found messages for wrong types', () => {
		const issues = expectIssues(readFixture('wrong-types.json'));
		const byPath = new Map(issues.map((i) => [i.path, i.message]));
		expect(byPath.get('$.integration_s')).toBe('expected a number, found the text "8"');
		expect(byPath.get('$.scans[3].field_id')).toBe('expected an integer, found the number 1.5');
		expect(byPath.get('$.spectral_windows[0].n_chan')).toBe('expected a value at most 65536, found the integer 100000');
		expect(byPath.get('$.fields[1].intents[0]')).toMatch(/^expected one of "flux_calibrator", .* found the text "phase_cal"$/);
		expect(byPath.get('$.array')).toMatch(/unknown key "sefd"/);
	});

	it('reports scans that reference missing fields or windows', () => {
		const issues = expectIssues(readFixture('missing-references.json'));
		expect(issues).toContainEqual({ path: '$.scans[3].field_id', message: 'expected the id of a field in $.fields (0, 1, 2, 3), found 9' });
		expect(issues).toContainEqual({ path: '$.scans[4].spw_ids[1]', message: 'expected the id of a spectral window in $.spectral_windows (0), found 5' });
	});

	it('reports duplicate antenna names, field names and scan ids', () => {
		const paths = expectIssues(readFixture('duplicates.json')).map((i) => i.path);
		expect(paths).toEqual(expect.arrayContaining(['$.array.antennas[5].name', '$.fields[2].name', '$.scans[2].id']));
	});

	it('reports a scan ending before it starts and a flagged antenna not in the array', () => {
		const issues = expectIssues(readFixture('inconsistent-times-and-flags.json'));
		expect(issues.map((i) => i.path)).toEqual(['$.scans[1].end_utc', '$.flagged_antennas[0]']);
		expect(issues[1]?.message).toBe('expected the name of an antenna in $.array.antennas, found "CF99"');
	});

	it('warns about too few antennas and unobserved fields without rejecting', () => {
		const s = createDemoObservation();
		s.array.antennas = s.array.antennas.slice(0, 3);
		s.flagged_antennas = ['CF02'];
		s.fields.push({ id: 7, name: 'Spare', ra_deg: 1, dec_deg: 1 });
		const result = parseObservationValue(s);
		expect(result.ok).toBe(true);
		// Gains need at least 3 antennas (IRAM Interferometry School 2002, via METHODS.md §3).
		if (result.ok) expect(result.value.warnings.map((w) => w.path)).toEqual(['$.array.antennas', '$.fields[4]']);
	});
});

describe('scanStatistics', () => {
	it('summarises scan durations per field', () => {
		const s = createDemoObservation();
		s.scans = [
			{ id: 1, field_id: 0, start_utc: '2026-03-14T20:00:00Z', end_utc: '2026-03-14T20:10:00Z', spw_ids: [0] },
			{ id: 2, field_id: 1, start_utc: '2026-03-14T20:10:30Z', end_utc: '2026-03-14T20:12:30Z', spw_ids: [0] },
			{ id: 3, field_id: 1, start_utc: '2026-03-14T20:20:00Z', end_utc: '2026-03-14T20:21:00Z', spw_ids: [0] },
			{ id: 4, field_id: 1, start_utc: '2026-03-14T20:30:00Z', end_utc: '2026-03-14T20:35:00+00:00', spw_ids: [0] }
		];
		const stats = scanStatistics(s);
		expect(stats[0]).toEqual({ field_id: 0, field_name: '3C286', count: 1, total_s: 600, min_s: 600, median_s: 600, max_s: 600 });
		expect(stats[1]).toEqual({ field_id: 1, field_name: 'CFA-GCAL-1', count: 3, total_s: 480, min_s: 60, median_s: 120, max_s: 300 });
		expect(stats[2]).toEqual({ field_id: 2, field_name: 'Nursery-North', count: 0, total_s: 0, min_s: null, median_s: null, max_s: null });
	});

	it('matches the demo design: 10 min flux scans, 2 min gain-calibrator scans', () => {
		const stats = scanStatistics(createDemoObservation());
		expect(stats[0]).toMatchObject({ count: 2, min_s: 600, max_s: 600 });
		expect(stats[1]).toMatchObject({ count: 9, min_s: 120, max_s: 120 });
	});
});

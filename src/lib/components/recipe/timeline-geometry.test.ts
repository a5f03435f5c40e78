import { describe, expect, it } from 'vitest';
import type { ObservationField, Scan } from '$lib/calibration/observation-schema';
import { chooseTickStepMin, computeTimeTicks, formatDuration, formatUtcClock, layoutTimeline } from './timeline-geometry';
import { ROLE_STYLES } from './role-palette';

// Check values below are derived by hand from the linear map x = (t − t0) / (t1 − t0) · width (first principles).
const fields: ObservationField[] = [
	{ id: 0, name: 'CAL-A', ra_deg: 10, dec_deg: 20 },
	{ id: 1, name: 'SRC-B', ra_deg: 30, dec_deg: 40 },
	{ id: 2, name: 'PHASE-C', ra_deg: 35, dec_deg: 42 }
];
function makeScan(id: number, fieldId: number, start: string, end: string): Scan {
	return { id, field_id: fieldId, start_utc: `2026-03-14T${start}:00Z`, end_utc: `2026-03-14T${end}:00Z`, spw_ids: [0] };
}
// One hour, 20:00–21:00: at 600 px one minute is 10 px.
const scans: Scan[] = [
	makeScan(1, 0, '20:00', '20:10'),
	makeScan(2, 2, '20:12', '20:14'),
	makeScan(3, 1, '20:14', '20:44'),
	makeScan(4, 2, '20:44', '20:46'),
	makeScan(5, 1, '20:46', '21:00')
];

describe('layoutTimeline', () => {
	it('maps start and end UTC linearly over the observation span', () => {
		const layout = layoutTimeline({ scans, fields, width: 600 });
		const third = layout.rects.find((r) => r.scanId === 3);
		expect(third?.x).toBeCloseTo(140, 9); // 14 min × 10 px/min
		expect(third?.width).toBeCloseTo(300, 9); // 30 min
		expect(third?.durationS).toBe(1800);
		const last = layout.rects.find((r) => r.scanId === 5);
		expect((last?.x ?? 0) + (last?.width ?? 0)).toBeCloseTo(600, 9);
		expect(layout.spanStartMs).toBe(Date.parse('2026-03-14T20:00:00Z'));
		expect(layout.spanEndMs).toBe(Date.parse('2026-03-14T21:00:00Z'));
	});

	it('gives very short scans at least 1 px and keeps them inside the strip', () => {
		const short: Scan[] = [
			{ id: 1, field_id: 0, start_utc: '2026-03-14T20:00:00Z', end_utc: '2026-03-14T22:00:00Z', spw_ids: [0] },
			{ id: 2, field_id: 1, start_utc: '2026-03-14T21:59:59Z', end_utc: '2026-03-14T22:00:00Z', spw_ids: [0] }
		];
		const layout = layoutTimeline({ scans: short, fields, width: 300 });
		const tiny = layout.rects.find((r) => r.scanId === 2);
		// 1 s of 7200 s at 300 px is 0.0417 px, widened to 1 px, ending at the strip's right edge.
		expect(tiny?.width).toBe(1);
		expect((tiny?.x ?? 0) + (tiny?.width ?? 0)).toBeLessThanOrEqual(300);
		expect(tiny?.x).toBeCloseTo(299, 9);
	});

	it('puts one row per observed field, calibrators before targets once roles are set', () => {
		const roles = [
			{ name: 'SRC-B', roles: ['target' as const] },
			{ name: 'PHASE-C', roles: ['gain_calibrator' as const] },
			{ name: 'CAL-A', roles: ['bandpass_calibrator' as const, 'flux_calibrator' as const] }
		];
		const layout = layoutTimeline({ scans, fields, roles, width: 600, rowHeight: 20, rowGap: 4 });
		expect(layout.rows.map((r) => r.label)).toEqual(['CAL-A', 'PHASE-C', 'SRC-B']);
		expect(layout.rows.map((r) => r.y)).toEqual([0, 24, 48]);
		expect(layout.height).toBe(3 * 20 + 2 * 4);
		// A field with flux and bandpass roles is coloured as the flux calibrator and described with both roles.
		expect(layout.rows[0]?.roleKey).toBe('flux_calibrator');
		expect(layout.rows[0]?.detail).toBe('Flux calibrator, Bandpass calibrator');
		const srcRects = layout.rects.filter((r) => r.field === 'SRC-B');
		expect(srcRects.map((r) => r.row)).toEqual([2, 2]);
		expect(srcRects.every((r) => r.roleKey === 'target')).toBe(true);
	});

	it('is neutral before roles are set', () => {
		const layout = layoutTimeline({ scans, fields, width: 600 });
		expect(new Set(layout.rects.map((r) => r.roleKey))).toEqual(new Set(['unassigned']));
		expect(layout.rows.map((r) => r.label)).toEqual(['CAL-A', 'PHASE-C', 'SRC-B']);
	});

	it('can group rows by leading role instead of by field', () => {
		const roles = [
			{ name: 'SRC-B', roles: ['target' as const] },
			{ name: 'PHASE-C', roles: ['target' as const] },
			{ name: 'CAL-A', roles: ['flux_calibrator' as const] }
		];
		const layout = layoutTimeline({ scans, fields, roles, width: 600, rowBy: 'role' });
		expect(layout.rows.map((r) => r.label)).toEqual([ROLE_STYLES.flux_calibrator.label, ROLE_STYLES.target.label]);
		expect(layout.rows[1]?.detail).toBe('PHASE-C, SRC-B');
	});

	it('returns an empty layout for no scans', () => {
		const layout = layoutTimeline({ scans: [], fields, width: 600 });
		expect(layout.rects).toEqual([]);
		expect(layout.ticks).toEqual([]);
	});
});

describe('time ticks', () => {
	it('uses 10-minute steps on a 1-hour span at 600 px with ≥ 60 px spacing', () => {
		// 10 px per minute: 5 min is 50 px (too close), 10 min is 100 px.
		expect(chooseTickStepMin(3_600_000, 600, 60)).toBe(10);
		const { stepMin, ticks } = computeTimeTicks(Date.parse('2026-03-14T20:00:00Z'), Date.parse('2026-03-14T21:00:00Z'), 600, 60);
		expect(stepMin).toBe(10);
		expect(ticks.map((t) => t.label)).toEqual(['20:00', '20:10', '20:20', '20:30', '20:40', '20:50', '21:00']);
		expect(ticks[3]?.x).toBeCloseTo(300, 9);
	});

	it('moves to 15, 30 and 60 minutes as the span grows', () => {
		// 4 h at 800 px: 3.33 px/min → 15 min = 50 px < 60, 30 min = 100 px.
		expect(chooseTickStepMin(4 * 3_600_000, 800, 60)).toBe(30);
		// 2 h at 800 px: 6.67 px/min → 10 min = 66.7 px.
		expect(chooseTickStepMin(2 * 3_600_000, 800, 60)).toBe(10);
		// 3 h at 800 px: 4.44 px/min → 15 min = 66.7 px.
		expect(chooseTickStepMin(3 * 3_600_000, 800, 60)).toBe(15);
		// 8 h at 800 px: 1.67 px/min → 30 min = 50 px, 60 min = 100 px.
		expect(chooseTickStepMin(8 * 3_600_000, 800, 60)).toBe(60);
	});

	it('puts ticks on round UTC times even when the observation starts off the hour', () => {
		const { ticks } = computeTimeTicks(Date.parse('2026-03-14T20:07:30Z'), Date.parse('2026-03-14T21:02:00Z'), 600, 60);
		expect(ticks[0]?.label).toBe('20:10');
		// 2.5 min after the start on a 54.5-min span over 600 px.
		expect(ticks[0]?.x).toBeCloseTo((2.5 / 54.5) * 600, 9);
	});
});

describe('formatting', () => {
	it('formats UTC clock times and durations', () => {
		expect(formatUtcClock(Date.parse('2026-03-14T07:05:59Z'))).toBe('07:05');
		expect(formatDuration(45)).toBe('45 s');
		expect(formatDuration(600)).toBe('10 min');
		expect(formatDuration(150)).toBe('2 min 30 s');
		expect(formatDuration(3900)).toBe('1 h 05 min');
	});
});

import { describe, expect, it } from 'vitest';
import { rankReferenceAntennas, rankSummaryAntennas } from './reference-antenna';
import { createDemoObservation } from './demo-observation';

describe('rankReferenceAntennas', () => {
	it('reproduces the METHODS.md §11 check', () => {
		// METHODS.md §11 (project choice, derived check): positions (0,0), (100,0), (0,200), (−300,−100), (1000,500) m,
		// f = (0.95, 0.99, 0.98, 1.0, 1.0), antenna 1 absent from one scan → d = (0, 100, 200, 316.228, 1118.034),
		// s = (0.95, ineligible, 0.8906, 0.8586, 0.5) → antenna 0.
		const positions = [[0, 0], [100, 0], [0, 200], [-300, -100], [1000, 500]] as const;
		const fractions = [0.95, 0.99, 0.98, 1.0, 1.0];
		const candidates = positions.map(([e, n], i) => ({
			name: `A${i}`,
			east_m: e,
			north_m: n,
			up_m: 0,
			unflaggedFraction: fractions[i] ?? 0,
			minScanFraction: i === 1 ? 0 : 0.95
		}));
		const ranked = rankReferenceAntennas(candidates);
		expect(ranked.map((r) => r.name)).toEqual(['A0', 'A2', 'A3', 'A4', 'A1']);
		const byName = new Map(ranked.map((r) => [r.name, r]));
		expect(byName.get('A0')?.score).toBeCloseTo(0.95, 4);
		expect(byName.get('A2')?.score).toBeCloseTo(0.8906, 4);
		expect(byName.get('A3')?.score).toBeCloseTo(0.8586, 4);
		expect(byName.get('A4')?.score).toBeCloseTo(0.5, 4);
		expect(byName.get('A3')?.distanceM).toBeCloseTo(316.228, 3);
		expect(byName.get('A1')?.eligible).toBe(false);
		expect(byName.get('A1')?.reason).toMatch(/absent from a calibrator scan/);
	});

	it('breaks ties by the lower index', () => {
		// Two antennas mirror-symmetric about the centre score the same; METHODS.md §11 says ties go to the lower index.
		const mk = (name: string, e: number) => ({ name, east_m: e, north_m: 0, up_m: 0, unflaggedFraction: 1, minScanFraction: 1 });
		const ranked = rankReferenceAntennas([mk('B', 50), mk('A', -50), mk('C', 0)]);
		expect(ranked.map((r) => r.name)).toEqual(['C', 'B', 'A']);
	});

	it('excludes an antenna below 90 % in one scan', () => {
		// METHODS.md §11 eligibility threshold: ≥ 90 % unflagged in every calibrator scan.
		const ranked = rankReferenceAntennas([
			{ name: 'X', east_m: 0, north_m: 0, up_m: 0, unflaggedFraction: 0.99, minScanFraction: 0.89 },
			{ name: 'Y', east_m: 900, north_m: 0, up_m: 0, unflaggedFraction: 0.9, minScanFraction: 0.9 }
		]);
		expect(ranked[0]?.name).toBe('Y');
		expect(ranked[1]?.eligible).toBe(false);
	});
});

describe('rankSummaryAntennas', () => {
	it('ranks the flagged demo antenna last and a central one first', () => {
		const summary = createDemoObservation();
		const ranked = rankSummaryAntennas(summary);
		expect(ranked[ranked.length - 1]?.name).toBe('CF17');
		expect(ranked[0]?.eligible).toBe(true);
		const distances = ranked.filter((r) => r.eligible).map((r) => r.distanceM);
		// All unflagged antennas have f = 1 here, so the order must follow distance alone.
		expect([...distances].sort((a, b) => a - b)).toEqual(distances);
	});
});

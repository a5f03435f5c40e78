import { describe, expect, it } from 'vitest';
import {
	chooseNiceStep,
	computeEqualAspectBounds,
	computeLogTicks,
	computeNiceTicks,
	createLinearScale,
	createLogScale,
	sampleLogSpaced
} from './plot-scale';

// Expected values are derived by hand: steps are 1, 2 or 5 × 10^k (common practice for axis labels).

describe('nice ticks', () => {
	it('chooses 1-2-5 steps', () => {
		expect(chooseNiceStep(1000, 5)).toBe(200);
		expect(chooseNiceStep(1000, 4)).toBe(500); // 250 → 500
		expect(chooseNiceStep(0.7, 5)).toBeCloseTo(0.2, 12); // 0.14 → 0.2
		expect(chooseNiceStep(90, 10)).toBe(10); // 9 → 10
	});

	it('puts ticks on multiples of the step inside the range', () => {
		expect(computeNiceTicks(0, 1000, 5)).toEqual([0, 200, 400, 600, 800, 1000]);
		// 1430 / 5 = 286 → step 500; multiples of 500 inside −310..1120.
		expect(computeNiceTicks(-310, 1120, 5)).toEqual([0, 500, 1000]);
		expect(computeNiceTicks(1.0, 1.5, 5)).toEqual([1.0, 1.1, 1.2, 1.3, 1.4, 1.5]);
	});

	it('returns clean decimals, never binary noise such as 0.30000000000000004', () => {
		const ticks = computeNiceTicks(0, 1, 10);
		expect(ticks[3]).toBe(0.3);
		expect(ticks.every((t) => String(t).length <= 3)).toBe(true);
	});

	it('handles a range given backwards and an empty range', () => {
		expect(computeNiceTicks(10, 0, 5)).toEqual([0, 2, 4, 6, 8, 10]);
		expect(computeNiceTicks(3, 3)).toEqual([3]);
	});
});

describe('equal-aspect bounds', () => {
	it('uses one scale for both axes and centres the short axis', () => {
		// 200 m east × 100 m north with no padding, into 400 × 400 px: 2 px per metre; north grows to 200 m.
		const b = computeEqualAspectBounds([{ x: -100, y: 0 }, { x: 100, y: 100 }], 400, 400, 0);
		expect(b.scale).toBeCloseTo(2, 12);
		expect([b.xMin, b.xMax]).toEqual([-100, 100]);
		expect(b.yMin).toBeCloseTo(-50, 12);
		expect(b.yMax).toBeCloseTo(150, 12);
		expect((b.xMax - b.xMin) * b.scale).toBeCloseTo(400, 9);
		expect((b.yMax - b.yMin) * b.scale).toBeCloseTo(400, 9);
	});

	it('fits a tall array in a wide box and pads by a fraction of the larger side', () => {
		// 100 m east × 1000 m north, 10 % pad → 1200 m tall; 300 px tall box → 0.25 px/m; 600 px wide → 2400 m.
		const b = computeEqualAspectBounds([{ x: 0, y: 0 }, { x: 100, y: 1000 }], 600, 300, 0.1);
		expect(b.scale).toBeCloseTo(0.25, 12);
		expect(b.yMin).toBeCloseTo(-100, 9);
		expect(b.yMax).toBeCloseTo(1100, 9);
		expect(b.xMax - b.xMin).toBeCloseTo(2400, 9);
		expect((b.xMin + b.xMax) / 2).toBeCloseTo(50, 9);
	});

	it('gives a single antenna a finite scale', () => {
		const b = computeEqualAspectBounds([{ x: 5, y: 5 }], 100, 100);
		expect(Number.isFinite(b.scale)).toBe(true);
		expect(b.xMin).toBeLessThan(5);
		expect(b.xMax).toBeGreaterThan(5);
	});
});

describe('scales', () => {
	it('maps linearly, including a downward pixel range', () => {
		const y = createLinearScale([0, 10], [100, 0]);
		expect(y(0)).toBe(100);
		expect(y(2.5)).toBe(75);
	});

	it('maps logarithmically: each decade gets the same length', () => {
		const x = createLogScale([1, 1000], [0, 300]);
		expect(x(10)).toBeCloseTo(100, 9);
		expect(x(100)).toBeCloseTo(200, 9);
		expect(x(Math.sqrt(10))).toBeCloseTo(50, 9);
	});

	it('gives 1-2-5 log ticks over wide ranges and linear ticks over narrow ones', () => {
		expect(computeLogTicks(0.3, 60, 8)).toEqual([0.5, 1, 2, 5, 10, 20, 50]);
		expect(computeLogTicks(1, 100, 8)).toEqual([1, 2, 5, 10, 20, 50, 100]);
		// Over more than `maxCount` 1-2-5 values only the decades are kept.
		expect(computeLogTicks(1, 100000, 6)).toEqual([1, 10, 100, 1000, 10000, 100000]);
		// 14–18 holds no 1-2-5 value: linear ticks.
		expect(computeLogTicks(14, 18, 6)).toEqual([14, 15, 16, 17, 18]);
	});

	it('samples log-spaced values including both ends', () => {
		const v = sampleLogSpaced(1, 100, 3);
		expect(v[0]).toBeCloseTo(1, 12);
		expect(v[1]).toBeCloseTo(10, 12);
		expect(v[2]).toBeCloseTo(100, 12);
	});
});

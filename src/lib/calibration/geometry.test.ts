import { describe, expect, it } from 'vitest';
import { sepHav, sepPauwels } from 'astronomia/angle';
import { angularSeparationDeg } from './geometry';

const RAD = Math.PI / 180;
const hmsToDeg = (h: number, m: number, s: number) => (h + m / 60 + s / 3600) * 15;
const dmsToDeg = (sign: 1 | -1, d: number, m: number, s: number) => sign * (d + m / 60 + s / 3600);

describe('angularSeparationDeg (METHODS.md §10 checks, Vincenty 1975)', () => {
	it('gives the textbook separations', () => {
		// METHODS.md §10 (derived geometric identities): 90°, 2° near the pole, 180° antipodal, 45° from the pole.
		expect(angularSeparationDeg(0, 0, 90, 0)).toBeCloseTo(90, 12);
		expect(angularSeparationDeg(0, 89, 180, 89)).toBeCloseTo(2, 12);
		expect(angularSeparationDeg(0, 0, 180, 0)).toBeCloseTo(180, 12);
		expect(angularSeparationDeg(0, 90, 123, 45)).toBeCloseTo(45, 12);
		expect(angularSeparationDeg(150, 2, 160, 9)).toBeCloseTo(12.16356, 5);
	});

	it('keeps precision for 1″ and 0.001″ offsets, where the arccos form fails', () => {
		// METHODS.md §10: 1″ and 0.001″ declination offsets return 1.000000″ and 0.001000″.
		expect(angularSeparationDeg(10, 20, 10, 20 + 1 / 3600) * 3600).toBeCloseTo(1, 6);
		expect(angularSeparationDeg(10, 20, 10, 20 + 0.001 / 3600) * 3600).toBeCloseTo(0.001, 6);
	});

	it('reproduces separations between flux standards', () => {
		// Positions and separations from METHODS.md §10 (positions from memory, used only as inputs).
		const c286 = [hmsToDeg(13, 31, 8.2881), dmsToDeg(1, 30, 30, 32.959)] as const;
		const c48 = [hmsToDeg(1, 37, 41.2994), dmsToDeg(1, 33, 9, 35.133)] as const;
		const c147 = [hmsToDeg(5, 42, 36.1379), dmsToDeg(1, 49, 51, 7.234)] as const;
		const c138 = [hmsToDeg(5, 21, 9.886), dmsToDeg(1, 16, 38, 22.052)] as const;
		const p1934 = [hmsToDeg(19, 39, 25.0261), dmsToDeg(-1, 63, 42, 45.624)] as const;
		expect(angularSeparationDeg(...c286, ...c48)).toBeCloseTo(116.31226, 5);
		expect(angularSeparationDeg(...c147, ...c138)).toBeCloseTo(33.49399, 5);
		expect(angularSeparationDeg(...c286, ...p1934)).toBeCloseTo(117.96646, 5);
	});
});

/** Seeded generator so the comparison pairs are the same on every run. */
function createRandom(seed: number): () => number {
	let s = seed >>> 0;
	return () => {
		s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
		return s / 4294967296;
	};
}

describe('angularSeparationDeg against the astronomia package (Meeus ch. 17)', () => {
	const random = createRandom(42);
	const pairs: [number, number, number, number][] = [];
	for (let i = 0; i < 300; i++) {
		const ra1 = 360 * random();
		const dec1 = (Math.asin(2 * random() - 1) * 180) / Math.PI;
		const kind = i % 3;
		if (kind === 0) pairs.push([ra1, dec1, 360 * random(), (Math.asin(2 * random() - 1) * 180) / Math.PI]);
		else if (kind === 1) pairs.push([ra1, dec1, ra1 + (random() - 0.5) * 1e-4, dec1 + (random() - 0.5) * 1e-4]);
		else pairs.push([ra1, dec1, (ra1 + 180 + (random() - 0.5) * 1e-3) % 360, -dec1 + (random() - 0.5) * 1e-3]);
	}

	it('matches the stable (Pauwels) form to 1e-9 degrees for random, near-identical and near-antipodal pairs', () => {
		for (const [ra1, dec1, ra2, dec2] of pairs) {
			const reference = sepPauwels({ ra: ra1 * RAD, dec: dec1 * RAD }, { ra: ra2 * RAD, dec: dec2 * RAD }) / RAD;
			expect(Math.abs(angularSeparationDeg(ra1, dec1, ra2, dec2) - reference)).toBeLessThan(1e-9);
		}
	});

	it('matches the haversine form between 0.01° and 170°', () => {
		// astronomia's haversine uses 1 − cos, which cancels for tiny separations, and asin loses precision near 180°.
		for (const [ra1, dec1, ra2, dec2] of pairs) {
			const reference = sepHav({ ra: ra1 * RAD, dec: dec1 * RAD }, { ra: ra2 * RAD, dec: dec2 * RAD }) / RAD;
			if (reference > 0.01 && reference < 170) expect(Math.abs(angularSeparationDeg(ra1, dec1, ra2, dec2) - reference)).toBeLessThan(1e-8);
		}
	});
});

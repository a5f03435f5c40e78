import { describe, expect, it } from 'vitest';
import type { SolutionInterval } from '../../calibration/recipe';
import { formatChannelRanges, formatFluxModel, formatFrequency, formatInterval, formatNumber, formatTextPreview } from './param-format';

describe('param-format', () => {
	it('writes negative numbers with the minus sign U+2212 and drops floating-point noise', () => {
		// U+2212 MINUS SIGN: Unicode Standard, Mathematical Operators block.
		expect(formatNumber(-0.7)).toBe('\u22120.7');
		expect(formatNumber(0.1 + 0.2)).toBe('0.3');
		expect(formatNumber(15, { minDecimals: 1 })).toBe('15.0');
	});

	it('names the four interval modes of DESIGN.md in plain words', () => {
		const intervals: SolutionInterval[] = [{ mode: 'integration' }, { mode: 'scan' }, { mode: 'seconds', seconds: 90.5 }, { mode: 'observation' }];
		expect(intervals.map(formatInterval)).toEqual([
			'per integration',
			'per scan',
			'90.5 s',
			'whole observation'
		]);
	});

	it('chooses the frequency unit that keeps the number at or above 1', () => {
		expect([1.4e9, 843e6, 488281.25, 50].map(formatFrequency)).toEqual(['1.4 GHz', '843 MHz', '488.28125 kHz', '50 Hz']);
	});

	it('mentions curvature of a manual flux model only when it is not zero', () => {
		const model = { kind: 'manual' as const, flux_jy: 2.25, ref_freq_hz: 3e9, spectral_index: -0.8, curvature: -0.1 };
		expect(formatFluxModel(model, 'X')).toBe('manual 2.25 Jy at 3 GHz, \u03b1 \u22120.8, curvature \u22120.1');
	});

	it('sorts channel ranges and writes a single channel alone', () => {
		expect(formatChannelRanges([{ start: 700, end: 720 }, { start: 5, end: 5 }])).toBe('5, 700\u2013720');
		expect(formatChannelRanges([])).toBe('none');
	});

	it('cuts long user text to one quoted line', () => {
		expect(formatTextPreview('a\n b', 10)).toBe('\u201ca b\u201d');
		expect(formatTextPreview('x'.repeat(20), 10)).toBe(`\u201c${'x'.repeat(9)}\u2026\u201d`);
	});
});

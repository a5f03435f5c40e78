import { describe, expect, it } from 'vitest';
import type { Finding } from '$lib/calibration/validate';
import { classifyFindingPath, countFindings, describeCounts, groupFindings } from './findings-groups';

// Expectations follow DESIGN.md's vocabulary (paths point at recipe parameters; steps are listed in recipe order).
function makeFinding(code: string, severity: Finding['severity'], path: string): Finding {
	return { code, severity, path, message: `${code} message`, why: 'because', source: 'common practice' };
}

describe('classifyFindingPath', () => {
	it('reads the step index from step paths, with or without a leading $.', () => {
		expect(classifyFindingPath('steps[2].interval.seconds')).toEqual({ kind: 'step', index: 2 });
		expect(classifyFindingPath('$.steps[11]')).toEqual({ kind: 'step', index: 11 });
	});

	it('puts field, target and flux paths under fields, channel paths under channels', () => {
		expect(classifyFindingPath('fields[0].roles').kind).toBe('fields');
		expect(classifyFindingPath('targets[1].gain_calibrator').kind).toBe('fields');
		expect(classifyFindingPath('flux_models[0].model').kind).toBe('fields');
		expect(classifyFindingPath('clean_channels[0]').kind).toBe('channels');
		expect(classifyFindingPath('excluded_channels').kind).toBe('channels');
		expect(classifyFindingPath('reference_antenna.fallbacks[1]').kind).toBe('reference');
	});

	it('sends the step list itself, the title and empty paths to general', () => {
		expect(classifyFindingPath('steps').kind).toBe('general');
		expect(classifyFindingPath('').kind).toBe('general');
		expect(classifyFindingPath('title').kind).toBe('general');
	});
});

describe('groupFindings', () => {
	const steps = [{ kind: 'delay' as const }, { kind: 'bandpass_prep' as const }, { kind: 'bandpass' as const }];
	const findings = [
		makeFinding('a', 'note', ''),
		makeFinding('b', 'warning', 'steps[2].min_snr'),
		makeFinding('c', 'note', 'steps[2].interval'),
		makeFinding('d', 'error', 'steps[2].fields[0]'),
		makeFinding('e', 'warning', 'reference_antenna.primary'),
		makeFinding('f', 'error', 'fields[1].roles'),
		makeFinding('g', 'note', 'steps[0].search_window_ns'),
		makeFinding('h', 'warning', 'clean_channels[0]')
	];

	it('orders groups fields, channels, reference antenna, steps in recipe order, general', () => {
		const groups = groupFindings(findings, steps);
		expect(groups.map((g) => g.title)).toEqual([
			'Fields and roles',
			'Channels',
			'Reference antenna',
			'Step 1: Delay solve (K)',
			'Step 3: Bandpass solve (B)',
			'General'
		]);
	});

	it('lists errors, then warnings, then notes inside a group, and counts them', () => {
		const bandpass = groupFindings(findings, steps).find((g) => g.key === 'step:2');
		expect(bandpass?.findings.map((f) => f.code)).toEqual(['d', 'b', 'c']);
		expect(bandpass?.counts).toEqual({ error: 1, warning: 1, note: 1 });
	});

	it('still groups a step path when the step list is shorter than the path says', () => {
		const groups = groupFindings([makeFinding('x', 'error', 'steps[5].kind')], steps);
		expect(groups[0]?.title).toBe('Step 6');
	});

	it('returns no groups for no findings', () => {
		expect(groupFindings([], steps)).toEqual([]);
	});

	it('describes totals in words', () => {
		expect(describeCounts(countFindings(findings))).toBe('2 errors, 3 warnings, 3 notes');
		expect(describeCounts({ error: 1, warning: 0, note: 1 })).toBe('1 error, no warnings, 1 note');
	});
});

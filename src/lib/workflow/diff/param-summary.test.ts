import { describe, expect, it } from 'vitest';
import { summariseParams } from './param-summary';
import { createDefaultRecipe } from '../../calibration/defaults';
import { createDemoObservation } from '../../calibration/demo-observation';

describe('summariseParams', () => {
	const rows = summariseParams(createDefaultRecipe(createDemoObservation()));
	const value = (label: string) => rows.find((r) => r.label === label)?.value;

	it('names the reference antenna, its fallbacks and the channel ranges in plain words', () => {
		expect(value('Reference antenna')).toBe('CF01');
		expect(value('Fallback reference antennas')).toMatch(/^CF\d\d, CF\d\d/);
		expect(value('Clean channels')).toBe('461–562');
		expect(value('Excluded channels')).toBe('none');
	});
	it('describes every step in order with its interval and minimum SNR', () => {
		const steps = rows.filter((r) => r.label.startsWith('Step '));
		expect(steps.map((s) => s.label)).toEqual(['Step 1: Delay solve', 'Step 2: Provisional phase solve', 'Step 3: Bandpass solve', 'Step 4: Gain solve', 'Step 5: Flux bootstrap', 'Step 6: Apply', 'Step 7: Verify']);
		expect(steps[1]?.value).toMatch(/^phase only, .*minimum SNR 3$/);
	});
});

import { describe, expect, it } from 'vitest';
import { checkBaseVersion, freezeDeep, nextVersionNumber } from './versioning';

describe('nextVersionNumber', () => {
	it('starts a recipe at version 1', () => {
		expect(nextVersionNumber([])).toBe(1);
	});
	it('goes one past the highest version, whatever order they come in', () => {
		expect(nextVersionNumber([2, 5, 1])).toBe(6);
	});
	it('ignores values that are not version numbers', () => {
		expect(nextVersionNumber([3, Number.NaN, 2.5, -7])).toBe(4);
	});
});

describe('checkBaseVersion', () => {
	it('lets a draft based on the newest version become the next version', () => {
		expect(checkBaseVersion(4, 4)).toEqual({ ok: true, value: { next: 5 } });
	});
	it('lets the first version of a new recipe be saved as version 1', () => {
		expect(checkBaseVersion(null, null)).toEqual({ ok: true, value: { next: 1 } });
	});
	it('refuses a draft started from a version that is no longer the newest, naming both', () => {
		// STYLE.md §5: a stale base version is a conflict.
		const result = checkBaseVersion(3, 5);
		expect(result.ok).toBe(false);
		if (!result.ok) {
			expect(result.error.code).toBe('conflict');
			expect(result.error.message).toMatch(/Version 5 was saved after you started editing from version 3/);
		}
	});
	it('refuses a draft that claims a base version the recipe does not have', () => {
		const result = checkBaseVersion(2, null);
		expect(result.ok === false && result.error.code).toBe('conflict');
	});
});

describe('freezeDeep', () => {
	it('makes nested objects and arrays of a saved version read-only', () => {
		const version = freezeDeep({ params: { steps: [{ kind: 'gain', min_snr: 5 }] } });
		expect(Object.isFrozen(version.params.steps)).toBe(true);
		expect(() => {
			(version.params.steps[0] as { min_snr: number }).min_snr = 3;
		}).toThrow(TypeError);
	});
});

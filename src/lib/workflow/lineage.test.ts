import { describe, expect, it } from 'vitest';
import { findCompareTarget, traceLineage, type ForkLink } from './lineage';

// Invented recipe ids. Root R0; R1 forked from R0 v3; R2 forked from R1 v1.
function createLinks(extra: [string, ForkLink | null][] = []): Map<string, ForkLink | null> {
	return new Map<string, ForkLink | null>([
		['R0', null],
		['R1', { recipeId: 'R0', version: 3 }],
		['R2', { recipeId: 'R1', version: 1 }],
		...extra
	]);
}

describe('traceLineage', () => {
	it('follows forked_from links from a fork of a fork to the root', () => {
		expect(traceLineage('R2', createLinks())).toEqual({
			ok: true,
			value: {
				chain: [
					{ recipeId: 'R2', forkedFrom: { recipeId: 'R1', version: 1 } },
					{ recipeId: 'R1', forkedFrom: { recipeId: 'R0', version: 3 } },
					{ recipeId: 'R0', forkedFrom: null }
				],
				complete: true
			}
		});
	});

	it('gives a recipe that is not a fork a chain of itself', () => {
		expect(traceLineage('R0', createLinks())).toEqual({ ok: true, value: { chain: [{ recipeId: 'R0', forkedFrom: null }], complete: true } });
	});

	it('stops, marked incomplete, at an upstream recipe that is not available', () => {
		const result = traceLineage('R3', createLinks([['R3', { recipeId: 'GONE', version: 2 }]]));
		expect(result).toEqual({ ok: true, value: { chain: [{ recipeId: 'R3', forkedFrom: { recipeId: 'GONE', version: 2 } }], complete: false } });
	});

	it('refuses a lineage that loops back on itself', () => {
		const links = new Map<string, ForkLink | null>([
			['A', { recipeId: 'B', version: 1 }],
			['B', { recipeId: 'C', version: 1 }],
			['C', { recipeId: 'A', version: 2 }]
		]);
		const result = traceLineage('A', links);
		expect(result.ok).toBe(false);
		if (!result.ok) {
			expect(result.error.code).toBe('conflict');
			expect(result.error.message).toMatch(/loops: recipe C is recorded as forked from A/);
		}
	});

	it('refuses a recipe recorded as forked from itself', () => {
		const result = traceLineage('S', new Map([['S', { recipeId: 'S', version: 1 }]]));
		expect(result.ok === false && result.error.code).toBe('conflict');
	});

	it('reports an unknown starting recipe as not found', () => {
		const result = traceLineage('NOPE', createLinks());
		expect(result.ok === false && result.error.code).toBe('not_found');
	});
});

describe('findCompareTarget', () => {
	const fork: ForkLink = { recipeId: 'R0', version: 3 };

	it("targets the upstream's newest approved version, ignoring newer unapproved ones", () => {
		const target = findCompareTarget(fork, [
			{ version: 1, state: 'approved' },
			{ version: 3, state: 'approved' },
			{ version: 5, state: 'approved' },
			{ version: 6, state: 'in_review' },
			{ version: 7, state: 'draft' }
		]);
		expect(target).toEqual({ recipeId: 'R0', version: 5, reason: 'newest_approved', newerThanFork: true });
	});

	it('says when the newest approved version is the one the fork was made from', () => {
		expect(findCompareTarget(fork, [{ version: 3, state: 'approved' }, { version: 4, state: 'changes_requested' }])).toEqual({
			recipeId: 'R0',
			version: 3,
			reason: 'newest_approved',
			newerThanFork: false
		});
	});

	it('falls back to the forked version when the upstream has nothing approved', () => {
		expect(findCompareTarget(fork, [{ version: 3, state: 'draft' }, { version: 4, state: 'in_review' }])).toEqual({
			recipeId: 'R0',
			version: 3,
			reason: 'forked_version',
			newerThanFork: false
		});
	});

	it('has no target for a recipe that is not a fork', () => {
		expect(findCompareTarget(null, [{ version: 1, state: 'approved' }])).toBeNull();
	});
});

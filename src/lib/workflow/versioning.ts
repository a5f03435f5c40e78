import { fail, type DomainResult } from './errors';

// Version numbers of a recipe run 1, 2, 3… and a saved version never changes (DESIGN.md
// "Recipe"); a change is a new version or a fork.

/** The number the next saved version gets: one past the highest so far, or 1. */
export function nextVersionNumber(existing: readonly number[]): number {
	let highest = 0;
	for (const n of existing) if (Number.isInteger(n) && n > highest) highest = n;
	return highest + 1;
}

/**
 * Check that a draft is saved on top of the newest version: `base` is the version the draft
 * started from (null for a new recipe), `latest` the newest saved one (null if none).
 */
export function checkBaseVersion(base: number | null, latest: number | null): DomainResult<{ next: number }> {
	if (base === latest) return { ok: true, value: { next: (latest ?? 0) + 1 } };
	if (latest === null) return fail('conflict', `This draft says it started from version ${base}, but the recipe has no saved versions. Start the draft again from the recipe.`);
	const from = base === null ? 'a new recipe' : `version ${base}`;
	return fail(
		'conflict',
		`Version ${latest} was saved after you started editing from ${from}. Open version ${latest}, apply your changes to it and save again; nothing was overwritten.`
	);
}

export type DeepReadonly<T> = T extends (infer U)[]
	? readonly DeepReadonly<U>[]
	: T extends object
		? { readonly [K in keyof T]: DeepReadonly<T[K]> }
		: T;

/** Freeze a saved version's data in place, all the way down, so accidental edits throw in strict mode. */
export function freezeDeep<T>(value: T): DeepReadonly<T> {
	if (value !== null && typeof value === 'object' && !Object.isFrozen(value)) {
		Object.freeze(value);
		for (const child of Object.values(value)) freezeDeep(child);
	}
	return value as DeepReadonly<T>;
}

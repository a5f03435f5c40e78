import { fail, type DomainResult } from './errors';
import type { ReviewState } from './review-state';

// Fork lineage (DESIGN.md "Fork"): each fork keeps `forked_from` = the recipe and version it
// was copied from. Links come from the database, so they are checked, not trusted.

export type ForkLink = { recipeId: string; version: number };
/** One recipe on the way to the root; `forkedFrom` is null at the root. */
export type LineageEntry = { recipeId: string; forkedFrom: ForkLink | null };
export type Lineage = {
	/** From the recipe itself up to the furthest recipe known. */
	chain: LineageEntry[];
	/** False when an upstream recipe is not in the given links (deleted or not visible): the chain stops before it. */
	complete: boolean;
};

/** Follow `forked_from` links from a recipe to its root; refuses a lineage that loops. */
export function traceLineage(recipeId: string, links: ReadonlyMap<string, ForkLink | null>): DomainResult<Lineage> {
	const start = links.get(recipeId);
	if (start === undefined) return fail('not_found', `Recipe ${recipeId} is not among the recipes whose lineage was loaded.`);
	const chain: LineageEntry[] = [];
	const seen = new Set<string>();
	let id = recipeId;
	let link: ForkLink | null = start;
	for (;;) {
		seen.add(id);
		chain.push({ recipeId: id, forkedFrom: link });
		if (link === null) return { ok: true, value: { chain, complete: true } };
		if (seen.has(link.recipeId)) {
			return fail('conflict', `The fork lineage of recipe ${recipeId} loops: recipe ${id} is recorded as forked from ${link.recipeId}, which is already in its chain. The forked_from links need repair.`);
		}
		const next = links.get(link.recipeId);
		if (next === undefined) return { ok: true, value: { chain, complete: false } };
		id = link.recipeId;
		link = next;
	}
}

export type UpstreamVersion = { version: number; state: ReviewState };
export type CompareTarget = {
	recipeId: string;
	version: number;
	/** `newest_approved` normally; `forked_version` when the upstream has no approved version. */
	reason: 'newest_approved' | 'forked_version';
	/** Whether the target is newer than the version the fork was made from. */
	newerThanFork: boolean;
};

/** The upstream version a fork should be compared with: the upstream's newest approved version. */
export function findCompareTarget(forkedFrom: ForkLink | null, upstreamVersions: readonly UpstreamVersion[]): CompareTarget | null {
	if (!forkedFrom) return null;
	let newest: number | null = null;
	for (const v of upstreamVersions) if (v.state === 'approved' && (newest === null || v.version > newest)) newest = v.version;
	const version = newest ?? forkedFrom.version;
	return {
		recipeId: forkedFrom.recipeId,
		version,
		reason: newest === null ? 'forked_version' : 'newest_approved',
		newerThanFork: version > forkedFrom.version
	};
}

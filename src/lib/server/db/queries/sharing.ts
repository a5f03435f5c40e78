import { and, desc, eq, exists, gte, ilike, lte, or, sql } from 'drizzle-orm';
import type { Executor } from '../client';
import { observations, recipes, recipeShares, recipeVersions, teams, users, versionReviewStates } from '../schema';
import type { ForkLink } from '$lib/workflow/lineage';

export type RecipeShare = { recipeId: string; sharedAt: Date; sharedBy: string | null; sharedByEmail: string | null };

export async function getRecipeShare(db: Executor, recipeId: string): Promise<RecipeShare | null> {
	const rows = await db
		.select({ recipeId: recipeShares.recipeId, sharedAt: recipeShares.sharedAt, sharedBy: recipeShares.sharedBy, sharedByEmail: users.email })
		.from(recipeShares)
		.leftJoin(users, eq(users.id, recipeShares.sharedBy))
		.where(eq(recipeShares.recipeId, recipeId))
		.limit(1);
	return rows[0] ?? null;
}

/** Inserts the share; false when the recipe was shared already. */
export async function insertRecipeShare(
	db: Executor,
	s: { recipeId: string; sharedBy: string; arrayName: string | null; minFreqHz: number | null; maxFreqHz: number | null; now: Date }
): Promise<boolean> {
	const rows = await db
		.insert(recipeShares)
		.values({ recipeId: s.recipeId, sharedBy: s.sharedBy, arrayName: s.arrayName, minFreqHz: s.minFreqHz, maxFreqHz: s.maxFreqHz, sharedAt: s.now })
		.onConflictDoNothing()
		.returning({ recipeId: recipeShares.recipeId });
	return rows.length > 0;
}

/** Deletes the share; false when the recipe was not shared. */
export async function deleteRecipeShare(db: Executor, recipeId: string): Promise<boolean> {
	const rows = await db.delete(recipeShares).where(eq(recipeShares.recipeId, recipeId)).returning({ recipeId: recipeShares.recipeId });
	return rows.length > 0;
}

export type SharedRecipeItem = {
	recipeId: string;
	title: string;
	teamId: string;
	teamName: string;
	observationName: string | null;
	arrayName: string | null;
	minFreqHz: number | null;
	maxFreqHz: number | null;
	sharedAt: Date;
	latestVersion: number | null;
	newestApprovedVersion: number | null;
	/** Opaque position of this row for keyset pagination. */
	position: { sharedAtMicros: string; recipeId: string };
};

export type SharedRecipeQuery = {
	text: string;
	arrayName: string | null;
	minFreqHz: number | null;
	maxFreqHz: number | null;
	approvedOnly: boolean;
	after: { sharedAtMicros: string; recipeId: string } | null;
	limit: number;
};

const sharedAtMicros = sql<string>`((extract(epoch from ${recipeShares.sharedAt}) * 1000000)::bigint)`;

function escapeLike(s: string): string {
	return s.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/** Shared recipes matching the filters, newest share first, one keyset page. */
export async function listSharedRecipes(db: Executor, q: SharedRecipeQuery): Promise<SharedRecipeItem[]> {
	const approved = db
		.select({ one: sql`1` })
		.from(recipeVersions)
		.innerJoin(versionReviewStates, eq(versionReviewStates.recipeVersionId, recipeVersions.id))
		.where(and(eq(recipeVersions.recipeId, recipes.id), eq(versionReviewStates.state, 'approved')));
	const pattern = `%${escapeLike(q.text)}%`;
	const where = and(
		q.text === '' ? undefined : or(ilike(recipes.title, pattern), ilike(observations.name, pattern), ilike(teams.name, pattern)),
		q.arrayName === null ? undefined : ilike(recipeShares.arrayName, escapeLike(q.arrayName)),
		// Overlap of the observation's coverage with the asked range.
		q.minFreqHz === null ? undefined : gte(recipeShares.maxFreqHz, q.minFreqHz),
		q.maxFreqHz === null ? undefined : lte(recipeShares.minFreqHz, q.maxFreqHz),
		q.approvedOnly ? exists(approved) : undefined,
		q.after === null ? undefined : sql`(${sharedAtMicros}, ${recipeShares.recipeId}) < (${q.after.sharedAtMicros}::bigint, ${q.after.recipeId}::uuid)`
	);
	const rows = await db
		.select({
			recipeId: recipes.id,
			title: recipes.title,
			teamId: recipes.teamId,
			teamName: teams.name,
			observationName: observations.name,
			arrayName: recipeShares.arrayName,
			minFreqHz: recipeShares.minFreqHz,
			maxFreqHz: recipeShares.maxFreqHz,
			sharedAt: recipeShares.sharedAt,
			micros: sql<string>`${sharedAtMicros}::text`,
			latestVersion: sql<number | null>`(select max(${recipeVersions.version}) from ${recipeVersions} where ${recipeVersions.recipeId} = ${recipes.id})`,
			newestApprovedVersion: sql<number | null>`(select max(rv.version) from ${recipeVersions} rv join ${versionReviewStates} s on s.recipe_version_id = rv.id where rv.recipe_id = ${recipes.id} and s.state = 'approved')`
		})
		.from(recipeShares)
		.innerJoin(recipes, eq(recipes.id, recipeShares.recipeId))
		.innerJoin(teams, eq(teams.id, recipes.teamId))
		.leftJoin(observations, eq(observations.id, recipes.observationId))
		.where(where)
		.orderBy(desc(recipeShares.sharedAt), desc(recipeShares.recipeId))
		.limit(q.limit);
	return rows.map(({ micros, ...r }) => ({ ...r, position: { sharedAtMicros: micros, recipeId: r.recipeId } }));
}

/** Records where a fork came from. */
export async function setRecipeForkedFrom(db: Executor, recipeId: string, link: ForkLink): Promise<void> {
	await db.update(recipes).set({ forkedFromRecipeId: link.recipeId, forkedFromVersion: link.version }).where(eq(recipes.id, recipeId));
}

export type RecipeLineageRow = { recipeId: string; teamId: string; title: string; teamName: string; shared: boolean; forkedFrom: ForkLink | null };

/** One recipe's fork link with what a lineage view shows of it. */
export async function getRecipeLineageRow(db: Executor, recipeId: string): Promise<RecipeLineageRow | null> {
	const rows = await db
		.select({
			recipeId: recipes.id,
			teamId: recipes.teamId,
			title: recipes.title,
			teamName: teams.name,
			shared: sql<boolean>`${recipeShares.recipeId} is not null`,
			fromId: recipes.forkedFromRecipeId,
			fromVersion: recipes.forkedFromVersion
		})
		.from(recipes)
		.innerJoin(teams, eq(teams.id, recipes.teamId))
		.leftJoin(recipeShares, eq(recipeShares.recipeId, recipes.id))
		.where(eq(recipes.id, recipeId))
		.limit(1);
	const r = rows[0];
	if (!r) return null;
	const forkedFrom = r.fromId !== null && r.fromVersion !== null ? { recipeId: r.fromId, version: r.fromVersion } : null;
	return { recipeId: r.recipeId, teamId: r.teamId, title: r.title, teamName: r.teamName, shared: r.shared, forkedFrom };
}

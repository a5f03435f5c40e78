import { and, asc, desc, eq, ilike, inArray, max, or, sql } from 'drizzle-orm';
import type { Executor } from '../client';
import { observations, recipes, recipeVersions, teams, users } from '../schema';
import type { RecipeParams } from '$lib/calibration/recipe';
import type { Finding } from '$lib/calibration/validate';

export type RecipeRow = {
	id: string;
	teamId: string;
	title: string;
	observationId: string | null;
	draft: RecipeParams;
	draftRevision: number;
	updatedAt: Date;
};

export type RecipeVersionRow = {
	id: string;
	recipeId: string;
	version: number;
	params: RecipeParams;
	paramsSha256: string;
	templateVersionId: string;
	program: string;
	programSha256: string;
	findings: Finding[];
	message: string;
	authorEmail: string | null;
	createdAt: Date;
};

const recipeColumns = {
	id: recipes.id,
	teamId: recipes.teamId,
	title: recipes.title,
	observationId: recipes.observationId,
	draft: recipes.draft,
	draftRevision: recipes.draftRevision,
	updatedAt: recipes.updatedAt
};

export async function insertRecipe(db: Executor, r: { teamId: string; title: string; observationId: string | null; draft: RecipeParams; userId: string | null }): Promise<{ id: string }> {
	const [row] = await db
		.insert(recipes)
		.values({ teamId: r.teamId, title: r.title, observationId: r.observationId, draft: r.draft, createdBy: r.userId, updatedBy: r.userId })
		.returning({ id: recipes.id });
	if (!row) throw new Error('insert into recipes returned no row');
	return row;
}

/** One recipe; `forUpdate` locks it for the rest of the transaction. */
export async function getRecipe(db: Executor, id: string, forUpdate = false): Promise<RecipeRow | null> {
	const q = db.select(recipeColumns).from(recipes).where(eq(recipes.id, id)).limit(1);
	const rows = forUpdate ? await q.for('update') : await q;
	return rows[0] ?? null;
}

export async function updateDraft(db: Executor, id: string, d: { draft: RecipeParams; title: string; revision: number; userId: string | null; now: Date }): Promise<void> {
	await db.update(recipes).set({ draft: d.draft, title: d.title, draftRevision: d.revision, updatedBy: d.userId, updatedAt: d.now }).where(eq(recipes.id, id));
}

export async function getLatestVersionNumber(db: Executor, recipeId: string): Promise<number> {
	const [row] = await db.select({ v: max(recipeVersions.version) }).from(recipeVersions).where(eq(recipeVersions.recipeId, recipeId));
	return row?.v ?? 0;
}

export async function insertRecipeVersion(
	db: Executor,
	v: Omit<RecipeVersionRow, 'id' | 'authorEmail' | 'createdAt'> & { authorId: string | null }
): Promise<{ id: string }> {
	const [row] = await db.insert(recipeVersions).values(v).returning({ id: recipeVersions.id });
	if (!row) throw new Error('insert into recipe_versions returned no row');
	return row;
}

const versionColumns = {
	id: recipeVersions.id,
	recipeId: recipeVersions.recipeId,
	version: recipeVersions.version,
	params: recipeVersions.params,
	paramsSha256: recipeVersions.paramsSha256,
	templateVersionId: recipeVersions.templateVersionId,
	program: recipeVersions.program,
	programSha256: recipeVersions.programSha256,
	findings: recipeVersions.findings,
	message: recipeVersions.message,
	authorEmail: users.email,
	createdAt: recipeVersions.createdAt
};

export async function getRecipeVersion(db: Executor, recipeId: string, version: number): Promise<RecipeVersionRow | null> {
	const rows = await db
		.select(versionColumns)
		.from(recipeVersions)
		.leftJoin(users, eq(users.id, recipeVersions.authorId))
		.where(and(eq(recipeVersions.recipeId, recipeId), eq(recipeVersions.version, version)))
		.limit(1);
	return rows[0] ?? null;
}

export async function listRecipeVersions(db: Executor, recipeId: string): Promise<RecipeVersionRow[]> {
	return db.select(versionColumns).from(recipeVersions).leftJoin(users, eq(users.id, recipeVersions.authorId)).where(eq(recipeVersions.recipeId, recipeId)).orderBy(desc(recipeVersions.version));
}

export type RecipeListItem = {
	id: string;
	teamId: string;
	teamName: string;
	title: string;
	observationName: string | null;
	latestVersion: number | null;
	lastEditor: string | null;
	updatedAt: Date;
};

export const RECIPE_SORTS = ['updated', 'title', 'observation', 'version'] as const;
export type RecipeSort = (typeof RECIPE_SORTS)[number];

/** Recipes of the given teams, filtered by text, sorted, one page (offset pagination). */
export async function listRecipes(
	db: Executor,
	q: { teamIds: readonly string[]; text: string; sort: RecipeSort; descending: boolean; offset: number; limit: number }
): Promise<{ items: RecipeListItem[]; total: number }> {
	if (q.teamIds.length === 0) return { items: [], total: 0 };
	const latest = sql<number | null>`(select max(${recipeVersions.version}) from ${recipeVersions} where ${recipeVersions.recipeId} = ${recipes.id})`;
	const pattern = `%${q.text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
	const where = and(
		inArray(recipes.teamId, [...q.teamIds]),
		q.text === '' ? undefined : or(ilike(recipes.title, pattern), ilike(observations.name, pattern))
	);
	const sortColumn = { updated: recipes.updatedAt, title: recipes.title, observation: observations.name, version: latest }[q.sort];
	const rows = await db
		.select({
			id: recipes.id,
			teamId: recipes.teamId,
			teamName: teams.name,
			title: recipes.title,
			observationName: observations.name,
			latestVersion: latest,
			lastEditor: users.email,
			updatedAt: recipes.updatedAt,
			total: sql<number>`count(*) over ()`.mapWith(Number)
		})
		.from(recipes)
		.innerJoin(teams, eq(teams.id, recipes.teamId))
		.leftJoin(observations, eq(observations.id, recipes.observationId))
		.leftJoin(users, eq(users.id, recipes.updatedBy))
		.where(where)
		.orderBy(q.descending ? sql`${sortColumn} desc nulls last` : sql`${sortColumn} asc nulls last`, asc(recipes.id))
		.limit(q.limit)
		.offset(q.offset);
	return { items: rows.map(({ total: _t, ...r }) => r), total: rows[0]?.total ?? 0 };
}

export async function setRecipeObservation(db: Executor, id: string, observationId: string): Promise<void> {
	await db.update(recipes).set({ observationId }).where(eq(recipes.id, id));
}

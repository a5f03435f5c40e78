import { and, desc, eq, max } from 'drizzle-orm';
import type { Executor } from '../client';
import { recipes, recipeVersions, users } from '../schema';
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

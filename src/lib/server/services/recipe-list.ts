import type { Executor } from '../db/client';
import { listRecipes, type RecipeSort } from '../db/queries/recipes';

export type RecipeListPage = {
	items: { id: string; team: string; title: string; observation: string | null; latestVersion: number | null; state: string; lastEditor: string | null; updatedAt: string }[];
	nextCursor: number | null;
	total: number;
};

/** One page of the recipes of the given teams, for the list page and its API. */
export async function listRecipePage(
	db: Executor,
	q: { teamIds: readonly string[]; text: string; sort: RecipeSort; descending: boolean; offset: number; limit: number }
): Promise<RecipeListPage> {
	const { items, total } = await listRecipes(db, q);
	return {
		items: items.map((r) => ({
			id: r.id,
			team: r.teamName,
			title: r.title,
			observation: r.observationName,
			latestVersion: r.latestVersion,
			state: r.latestVersion === null ? 'draft, no version yet' : `version ${r.latestVersion} saved`,
			lastEditor: r.lastEditor,
			updatedAt: r.updatedAt.toISOString()
		})),
		nextCursor: q.offset + items.length < total ? q.offset + items.length : null,
		total
	};
}

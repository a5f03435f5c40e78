import type { PageServerLoad } from './$types';
import { requirePageUser } from '$lib/server/guards';
import { getDb } from '$lib/server/db/client';
import { listRecipePage, type RecipeListPage } from '$lib/server/services/recipe-list';
import { recipeListQuerySchema, RECIPES_PAGE_SIZE, type RecipeListQuery } from '../../api/v1/recipes/contract';

// The first page is rendered on the server (works without JavaScript); the page then
// fetches further pages, sorting and filtering from /api/v1/recipes.
export const load: PageServerLoad = async (event): Promise<{ page: RecipeListPage; query: RecipeListQuery; hasTeam: boolean }> => {
	const user = requirePageUser(event);
	const parsed = recipeListQuerySchema.safeParse(Object.fromEntries(event.url.searchParams));
	const query = parsed.success ? parsed.data : recipeListQuerySchema.parse({});
	const page = await listRecipePage(getDb(), {
		teamIds: user.memberships.map((m) => m.teamId),
		text: query.q,
		sort: query.sort,
		descending: query.dir === 'desc',
		offset: query.cursor,
		limit: RECIPES_PAGE_SIZE
	});
	return { page, query, hasTeam: user.memberships.length > 0 };
};

import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiError, apiHandler } from '$lib/server/http';
import { requireUser } from '$lib/server/guards';
import { getDb } from '$lib/server/db/client';
import { listRecipePage } from '$lib/server/services/recipe-list';
import { recipeListQuerySchema, RECIPES_PAGE_SIZE, type RecipeListResponse } from './contract';

export const GET: RequestHandler = apiHandler(async (event) => {
	const user = requireUser(event);
	const parsed = recipeListQuerySchema.safeParse(Object.fromEntries(event.url.searchParams));
	if (!parsed.success) {
		return apiError({ code: 'validation_failed', message: 'Bad list parameters.', issues: parsed.error.issues.map((i) => ({ path: `?${i.path.join('.')}`, message: i.message })) });
	}
	const q = parsed.data;
	const mine = user.memberships.map((m) => m.teamId);
	const teamIds = q.team ? mine.filter((t) => t === q.team) : mine;
	const page: RecipeListResponse = await listRecipePage(getDb(), { teamIds, text: q.q, sort: q.sort, descending: q.dir === 'desc', offset: q.cursor, limit: RECIPES_PAGE_SIZE });
	return json(page);
});

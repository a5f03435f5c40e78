import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiError, apiHandler, readJson } from '$lib/server/http';
import { getDb } from '$lib/server/db/client';
import { loadRecipeFor } from '$lib/server/services/recipe-access';
import { saveVersion } from '$lib/server/services/recipes';
import { saveVersionRequestSchema, type SaveVersionResponse } from './contract';

export const POST: RequestHandler = apiHandler(async (event) => {
	const { recipe, user } = await loadRecipeFor(event, event.params.recipeId, 'recipe.edit');
	const body = await readJson(event.request, saveVersionRequestSchema);
	const r = await saveVersion(getDb(), {
		recipeId: recipe.id,
		userId: user.id,
		message: body.message,
		...(body.params !== undefined ? { params: body.params } : {}),
		...(body.base_revision !== undefined ? { baseRevision: body.base_revision } : {}),
		now: new Date()
	});
	if (!r.ok) return apiError(r.error);
	const res: SaveVersionResponse = r.value;
	return json(res, { status: 201 });
});

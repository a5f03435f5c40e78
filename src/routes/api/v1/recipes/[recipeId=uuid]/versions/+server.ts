import { error, json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiError, apiHandler, readJson } from '$lib/server/http';
import { requireCan, requireUser } from '$lib/server/guards';
import { getDb } from '$lib/server/db/client';
import { getRecipe } from '$lib/server/db/queries/recipes';
import { saveVersion } from '$lib/server/services/recipes';
import { saveVersionRequestSchema, type SaveVersionResponse } from './contract';

export const POST: RequestHandler = apiHandler(async (event) => {
	requireUser(event);
	const recipe = await getRecipe(getDb(), event.params.recipeId);
	if (!recipe) error(404, { message: 'No such recipe.', code: 'not_found' });
	const user = requireCan(event, 'recipe.edit', { teamId: recipe.teamId }, 'recipe.view');
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

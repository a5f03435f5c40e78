import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiError, apiHandler, readJson } from '$lib/server/http';
import { requireCan } from '$lib/server/guards';
import { getDb } from '$lib/server/db/client';
import { createRecipe } from '$lib/server/services/recipes';
import { createRecipeRequestSchema, type CreateRecipeResponse } from './contract';

export const POST: RequestHandler = apiHandler(async (event) => {
	const user = requireCan(event, 'recipe.create', { teamId: event.params.teamId }, 'team.view');
	const body = await readJson(event.request, createRecipeRequestSchema);
	const r = await createRecipe(getDb(), { teamId: event.params.teamId, observationId: body.observation_id, ...(body.title ? { title: body.title } : {}), userId: user.id });
	if (!r.ok) return apiError(r.error);
	const res: CreateRecipeResponse = r.value;
	return json(res, { status: 201 });
});

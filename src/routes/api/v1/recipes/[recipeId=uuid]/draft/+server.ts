import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiError, apiHandler, readJson } from '$lib/server/http';
import { getDb } from '$lib/server/db/client';
import { loadRecipeFor } from '$lib/server/services/recipe-access';
import { saveDraft } from '$lib/server/services/recipes';
import { saveDraftRequestSchema, type SaveDraftResponse } from './contract';

// Autosave of the wizard's working draft; a stale base revision is a 409, never an overwrite.
export const PUT: RequestHandler = apiHandler(async (event) => {
	const { recipe, user } = await loadRecipeFor(event, event.params.recipeId, 'recipe.edit');
	const body = await readJson(event.request, saveDraftRequestSchema);
	const r = await saveDraft(getDb(), { recipeId: recipe.id, baseRevision: body.base_revision, params: body.params, userId: user.id, now: new Date() });
	if (!r.ok) return apiError(r.error);
	const res: SaveDraftResponse = r.value;
	return json(res);
});

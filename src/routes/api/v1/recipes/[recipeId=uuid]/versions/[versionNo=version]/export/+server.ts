import type { RequestHandler } from './$types';
import { apiError, apiHandler } from '$lib/server/http';
import { getDb } from '$lib/server/db/client';
import { loadRecipeFor } from '$lib/server/services/recipe-access';
import { exportVersion } from '$lib/server/services/recipes';

// The `phasewright.recipe` v1 export of a saved version, as a download.
export const GET: RequestHandler = apiHandler(async (event) => {
	const { recipe } = await loadRecipeFor(event, event.params.recipeId, 'recipe.view');
	const r = await exportVersion(getDb(), recipe.id, Number(event.params.versionNo));
	if (!r.ok) return apiError(r.error);
	return new Response(`${JSON.stringify(r.value.export, null, 2)}\n`, {
		headers: {
			'content-type': 'application/json; charset=utf-8',
			'content-disposition': `attachment; filename="${r.value.filename}"`,
			'cache-control': 'private, no-store'
		}
	});
});

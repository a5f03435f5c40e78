import { error } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiHandler } from '$lib/server/http';
import { requireCan, requireUser } from '$lib/server/guards';
import { getDb } from '$lib/server/db/client';
import { getRecipe, getRecipeVersion } from '$lib/server/db/queries/recipes';
import { programFilename } from '$lib/script/filename';

// A saved version's program, exactly as stored (its SHA-256 in a header for checking).
export const GET: RequestHandler = apiHandler(async (event) => {
	requireUser(event);
	const recipe = await getRecipe(getDb(), event.params.recipeId);
	if (!recipe) error(404, { message: 'No such recipe.', code: 'not_found' });
	requireCan(event, 'recipe.view', { teamId: recipe.teamId }, 'recipe.view');
	const v = await getRecipeVersion(getDb(), recipe.id, Number(event.params.versionNo));
	if (!v) error(404, { message: `This recipe has no version ${event.params.versionNo}.`, code: 'not_found' });
	const name = programFilename(v.params.title, v.version);
	return new Response(v.program, {
		headers: {
			'content-type': 'text/x-python; charset=utf-8',
			'content-disposition': `attachment; filename="${name}"`,
			'x-program-sha256': v.programSha256,
			'cache-control': 'private, no-store'
		}
	});
});

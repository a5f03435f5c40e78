import { error } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiHandler } from '$lib/server/http';
import { getDb } from '$lib/server/db/client';
import { getRecipeVersion } from '$lib/server/db/queries/recipes';
import { loadRecipeFor } from '$lib/server/services/recipe-access';
import { programFilename } from '$lib/script/filename';

// A saved version's program, exactly as stored (its SHA-256 in a header for checking).
export const GET: RequestHandler = apiHandler(async (event) => {
	const { recipe } = await loadRecipeFor(event, event.params.recipeId, 'recipe.view');
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

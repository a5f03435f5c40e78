import type { PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { getObservation } from '$lib/server/db/queries/observations';
import { listRecipeVersions } from '$lib/server/db/queries/recipes';
import { actorOf } from '$lib/server/guards';
import { loadRecipeFor } from '$lib/server/services/recipe-access';
import { countFindings } from '$lib/components/recipe/findings-groups';
import { can } from '$lib/workflow/permissions';

export type RecipePageData = {
	recipe: { id: string; title: string; teamId: string; revision: number; updatedAt: string };
	observation: { id: string; name: string } | null;
	versions: { version: number; message: string; author: string | null; createdAt: string; programSha256: string; errors: number; warnings: number; notes: number }[];
	canEdit: boolean;
};

export const load: PageServerLoad = async (event): Promise<RecipePageData> => {
	const { recipe, user } = await loadRecipeFor(event, event.params.recipeId, 'recipe.view');
	const obs = recipe.observationId ? await getObservation(getDb(), recipe.observationId) : null;
	const versions = await listRecipeVersions(getDb(), recipe.id);
	return {
		recipe: { id: recipe.id, title: recipe.title, teamId: recipe.teamId, revision: recipe.draftRevision, updatedAt: recipe.updatedAt.toISOString() },
		observation: obs ? { id: obs.id, name: obs.name } : null,
		versions: versions.map((v) => {
			const c = countFindings(v.findings);
			return { version: v.version, message: v.message, author: v.authorEmail, createdAt: v.createdAt.toISOString(), programSha256: v.programSha256, errors: c.error, warnings: c.warning, notes: c.note };
		}),
		canEdit: can(actorOf(user), 'recipe.edit', { teamId: recipe.teamId })
	};
};

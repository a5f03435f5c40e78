import { error } from '@sveltejs/kit';
import { getDb } from '../db/client';
import { getRecipe, type RecipeRow } from '../db/queries/recipes';
import { requireCan, requireUser, type GuardEvent } from '../guards';
import type { SessionUser } from '../db/queries/users';
import type { Action } from '$lib/workflow/permissions';
import { getShare } from './sharing';

/**
 * Loads a recipe and checks that the caller may do `action` on it: 401 signed out, 404 when
 * the recipe does not exist or is not visible to the caller's teams, 403 when the role is too low.
 */
export async function loadRecipeFor(event: GuardEvent, recipeId: string, action: Action): Promise<{ recipe: RecipeRow; user: SessionUser }> {
	requireUser(event);
	const recipe = await getRecipe(getDb(), recipeId);
	if (!recipe) error(404, { message: 'No such recipe, or it is not visible to your teams.', code: 'not_found' });
	// A shared recipe is visible (read-only, forkable) to every team.
	const shared = (await getShare(getDb(), recipe.id)) !== null;
	const user = requireCan(event, action, { teamId: recipe.teamId, shared }, 'recipe.view');
	return { recipe, user };
}

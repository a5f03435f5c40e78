import { error } from '@sveltejs/kit';
import { getDb } from '../db/client';
import { getRecipe, type RecipeRow } from '../db/queries/recipes';
import { requireCan, requireUser, type GuardEvent } from '../guards';
import type { SessionUser } from '../db/queries/users';
import type { Action } from '$lib/workflow/permissions';

/**
 * Loads a recipe and checks that the caller may do `action` on it: 401 signed out, 404 when
 * the recipe does not exist or is not visible to the caller's teams, 403 when the role is too low.
 */
export async function loadRecipeFor(event: GuardEvent, recipeId: string, action: Action): Promise<{ recipe: RecipeRow; user: SessionUser }> {
	requireUser(event);
	const recipe = await getRecipe(getDb(), recipeId);
	if (!recipe) error(404, { message: 'No such recipe, or it is not visible to your teams.', code: 'not_found' });
	const user = requireCan(event, action, { teamId: recipe.teamId }, 'recipe.view');
	return { recipe, user };
}

import { error } from '@sveltejs/kit';
import { getDb } from '../db/client';
import { getRulePolicy } from '../db/queries/teams';
import { getObservation } from '../db/queries/observations';
import { requireCan, type GuardEvent } from '../guards';
import { ApiValidationError } from '../http';
import { parseRecipeParamsValue, type RecipeParams } from '$lib/calibration/recipe';
import { parseObservationValue, type ObservationSummary } from '$lib/calibration/observation';
import type { RulePolicy } from '$lib/calibration/validate';

export type CheckInputs = { recipe: RecipeParams; observation: ObservationSummary | null; policy: RulePolicy | null; teamId: string | null };

/**
 * Turns a validate/render request into checked inputs: the recipe parsed, the observation
 * loaded (only from a team the caller belongs to) or parsed inline, and the team's rule policy.
 */
export async function resolveCheckInputs(
	event: GuardEvent,
	body: { recipe: unknown; observation_id?: string; observation?: unknown; team_id?: string }
): Promise<CheckInputs> {
	const recipe = parseRecipeParamsValue(body.recipe);
	if (!recipe.ok) throw new ApiValidationError(recipe.error.issues.map((i) => ({ path: i.path.replace(/^\$/, '$.recipe'), message: i.message })));
	if (body.observation_id && body.observation !== undefined) {
		throw new ApiValidationError([{ path: '$.observation', message: 'send either observation_id or observation, not both' }]);
	}
	let observation: ObservationSummary | null = null;
	let teamId = body.team_id ?? null;
	if (body.observation_id) {
		const row = await getObservation(getDb(), body.observation_id);
		if (!row) error(404, { message: 'No such observation.', code: 'not_found' });
		requireCan(event, 'observation.view', { teamId: row.teamId }, 'observation.view');
		observation = row.summary;
		teamId = row.teamId;
	} else if (body.observation !== undefined) {
		const parsed = parseObservationValue(body.observation);
		if (!parsed.ok) throw new ApiValidationError(parsed.error.issues.map((i) => ({ path: i.path.replace(/^\$/, '$.observation'), message: i.message })));
		observation = parsed.value.summary;
	}
	let policy: RulePolicy | null = null;
	if (teamId) {
		requireCan(event, 'recipe.view', { teamId }, 'team.view');
		policy = await getRulePolicy(getDb(), teamId);
	}
	return { recipe: recipe.value, observation, policy, teamId };
}

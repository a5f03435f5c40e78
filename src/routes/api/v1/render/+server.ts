import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiError, apiHandler, readJson } from '$lib/server/http';
import { requireUser } from '$lib/server/guards';
import { getDb } from '$lib/server/db/client';
import { resolveCheckInputs } from '$lib/server/services/check-inputs';
import { renderWithTemplate } from '$lib/server/services/render';
import { ensureStarterTemplates, resolveTemplateVersion } from '$lib/server/services/templates';
import { STARTER_TEMPLATE_NAME } from '$lib/server/templates/starter';
import { renderRequestSchema, type RenderResponse } from './contract';

// A preview render: the program for a recipe that need not be saved (recipe id "preview").
export const POST: RequestHandler = apiHandler(async (event) => {
	requireUser(event);
	const body = await readJson(event.request, renderRequestSchema);
	const inputs = await resolveCheckInputs(event, body);
	await ensureStarterTemplates(getDb());
	const template = await resolveTemplateVersion(getDb(), body.template?.name ?? STARTER_TEMPLATE_NAME, body.template?.version ?? null, inputs.teamId);
	if (!template.ok) return apiError(template.error);
	const r = renderWithTemplate({ template: template.value, recipe: inputs.recipe, observation: inputs.observation, recipeId: 'preview', recipeVersion: 0 });
	if (!r.ok) return apiError(r.error);
	const res: RenderResponse = r.value;
	return json(res);
});

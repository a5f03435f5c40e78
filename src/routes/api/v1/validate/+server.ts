import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiHandler, readJson } from '$lib/server/http';
import { requireUser } from '$lib/server/guards';
import { resolveCheckInputs } from '$lib/server/services/check-inputs';
import { validate } from '$lib/calibration/validate';
import { validateRequestSchema, type ValidateResponse } from './contract';

export const POST: RequestHandler = apiHandler(async (event) => {
	requireUser(event);
	const body = await readJson(event.request, validateRequestSchema);
	const inputs = await resolveCheckInputs(event, body);
	const findings = validate(inputs.recipe, inputs.observation, inputs.policy);
	const count = (s: string) => findings.filter((f) => f.severity === s).length;
	const res: ValidateResponse = { findings, errors: count('error'), warnings: count('warning'), notes: count('note') };
	return json(res);
});

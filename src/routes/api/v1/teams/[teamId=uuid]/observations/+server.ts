import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiError, apiHandler, MAX_JSON_BODY_BYTES } from '$lib/server/http';
import { requireCan } from '$lib/server/guards';
import { getDb } from '$lib/server/db/client';
import { listObservationItems, uploadObservation } from '$lib/server/services/observations';
import type { ObservationListResponse, ObservationUploadResponse } from './contract';

export const GET: RequestHandler = apiHandler(async (event) => {
	requireCan(event, 'observation.view', { teamId: event.params.teamId }, 'team.view');
	const body: ObservationListResponse = { items: await listObservationItems(getDb(), event.params.teamId), nextCursor: null };
	return json(body);
});

// The body is the summary file itself (its exact bytes are stored and hashed).
export const POST: RequestHandler = apiHandler(async (event) => {
	const user = requireCan(event, 'observation.upload', { teamId: event.params.teamId }, 'team.view');
	const declared = Number(event.request.headers.get('content-length') ?? '0');
	if (declared > MAX_JSON_BODY_BYTES) return apiError({ code: 'validation_failed', message: `The file is larger than ${MAX_JSON_BODY_BYTES} bytes.` }, 413);
	const bytes = new Uint8Array(await event.request.arrayBuffer());
	const filename = event.request.headers.get('x-filename') ?? 'upload.json';
	const r = await uploadObservation(getDb(), { teamId: event.params.teamId, bytes, filename, userId: user.id });
	if (!r.ok) return apiError(r.error);
	const body: ObservationUploadResponse = r.value;
	return json(body, { status: 201 });
});

import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiError, apiHandler } from '$lib/server/http';
import { requireUser } from '$lib/server/guards';
import { getDb } from '$lib/server/db/client';
import { listSharedFromParams } from '$lib/server/services/shared-list';
import type { SharedListResponse } from './contract';

// Shared recipes of every team (read-only for others): ?q=&array=&min_mhz=&max_mhz=&approved=1&cursor=
export const GET: RequestHandler = apiHandler(async (event) => {
	requireUser(event);
	const r = await listSharedFromParams(getDb(), event.url.searchParams);
	if (!r.ok) return apiError(r.error);
	const body: SharedListResponse = { items: r.value.items, nextCursor: r.value.nextCursor };
	return json(body);
});

import { open, type FileHandle } from 'node:fs/promises';
import { Readable } from 'node:stream';
import { error } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiError, apiHandler } from '$lib/server/http';
import { getDb } from '$lib/server/db/client';
import { getObservation } from '$lib/server/db/queries/observations';
import { requireCan, requireUser } from '$lib/server/guards';
import { DEMO_BUNDLE_FILENAME, ensureDemoBundle, isDemoObservation } from '$lib/server/services/demo-bundle';

async function openIfPresent(path: string): Promise<FileHandle | null> {
	try {
		return await open(path, 'r');
	} catch {
		return null;
	}
}

// The demo observation's simulated visibility bundle (made on first request, then cached).
export const GET: RequestHandler = apiHandler(async (event) => {
	requireUser(event);
	const o = await getObservation(getDb(), event.params.observationId);
	if (!o) error(404, { message: 'No such observation.', code: 'not_found' });
	requireCan(event, 'observation.view', { teamId: o.teamId }, 'observation.view');
	if (!isDemoObservation(o)) error(404, { message: 'Only the demo observation comes with a simulated bundle.', code: 'not_found' });
	// a cached file may vanish (temporary-folder clean-up) between the check and the open: make it again once
	for (let attempt = 0; attempt < 2; attempt++) {
		const made = await ensureDemoBundle(o.summary, o.sha256);
		if (!made.ok) return apiError({ code: 'internal', message: made.error.message }, 503);
		const handle = await openIfPresent(made.path);
		if (!handle) continue;
		const size = (await handle.stat()).size;
		const body = Readable.toWeb(handle.createReadStream()) as ReadableStream<Uint8Array>;
		return new Response(body, {
			headers: {
				'content-type': 'application/octet-stream',
				'content-disposition': `attachment; filename="${DEMO_BUNDLE_FILENAME}"`,
				'content-length': String(size),
				'cache-control': 'private, no-store'
			}
		});
	}
	return apiError({ code: 'internal', message: 'The simulated bundle could not be read from the cache; try again.' }, 503);
});

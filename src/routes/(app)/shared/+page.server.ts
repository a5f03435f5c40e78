import { error } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';
import { requirePageUser } from '$lib/server/guards';
import { getDb } from '$lib/server/db/client';
import { listSharedFromParams } from '$lib/server/services/shared-list';
import type { SharedRow } from '../../api/v1/shared/contract';

export type SharedPageData = { items: SharedRow[]; nextCursor: string | null; query: { text: string; array: string; minMHz: string; maxMHz: string; approvedOnly: boolean } };

export const load: PageServerLoad = async (event): Promise<SharedPageData> => {
	requirePageUser(event);
	const r = await listSharedFromParams(getDb(), event.url.searchParams);
	if (!r.ok) error(400, { message: r.error.message, code: 'validation_failed' });
	return r.value;
};

import type { Executor } from '../db/client';
import { listShared, sharedQuerySchema } from './sharing';
import type { DomainResult } from '$lib/workflow/errors';
import { fail } from '$lib/workflow/errors';

export type SharedRow = {
	recipeId: string;
	title: string;
	team: string;
	observation: string | null;
	array: string | null;
	band: string | null;
	latestVersion: number | null;
	newestApprovedVersion: number | null;
	sharedAt: string;
};
export type SharedListResponse = { items: SharedRow[]; nextCursor: string | null };

/** Reads the Shared page's filters from URL parameters (frequencies in MHz) and lists one page. */
export async function listSharedFromParams(db: Executor, params: URLSearchParams): Promise<DomainResult<SharedListResponse & { query: { text: string; array: string; minMHz: string; maxMHz: string; approvedOnly: boolean } }>> {
	const mhz = (k: string) => {
		const v = (params.get(k) ?? '').trim();
		return v === '' ? null : Number(v) * 1e6;
	};
	const query = {
		text: params.get('q') ?? '',
		array: params.get('array') ?? '',
		minMHz: params.get('min_mhz') ?? '',
		maxMHz: params.get('max_mhz') ?? '',
		approvedOnly: params.get('approved') === '1'
	};
	const parsed = sharedQuerySchema.safeParse({
		text: query.text,
		array: query.array === '' ? null : query.array,
		minFreqHz: mhz('min_mhz'),
		maxFreqHz: mhz('max_mhz'),
		approvedOnly: query.approvedOnly,
		cursor: params.get('cursor'),
		limit: 20
	});
	if (!parsed.success) return fail('validation_failed', parsed.error.issues.map((i) => i.message).join(' '));
	const r = await listShared(db, parsed.data);
	if (!r.ok) return r;
	const band = (lo: number | null, hi: number | null) => (lo !== null && hi !== null ? `${(lo / 1e6).toFixed(0)}–${(hi / 1e6).toFixed(0)} MHz` : null);
	return {
		ok: true,
		value: {
			items: r.value.items.map((i) => ({
				recipeId: i.recipeId,
				title: i.title,
				team: i.teamName,
				observation: i.observationName,
				array: i.arrayName,
				band: band(i.minFreqHz, i.maxFreqHz),
				latestVersion: i.latestVersion,
				newestApprovedVersion: i.newestApprovedVersion,
				sharedAt: i.sharedAt.toISOString()
			})),
			nextCursor: r.value.nextCursor,
			query
		}
	};
}

import { z } from 'zod';
import type { Executor } from '../db/client';
import { getObservation } from '../db/queries/observations';
import { getLatestVersionNumber, getRecipe } from '../db/queries/recipes';
import { deleteRecipeShare, getRecipeShare, insertRecipeShare, listSharedRecipes, type RecipeShare, type SharedRecipeItem } from '../db/queries/sharing';
import type { ObservationSummary } from '$lib/calibration/observation';
import { getFreqSpanHz } from '$lib/calibration/spectral-window';
import { can } from '$lib/workflow/permissions';
import { fail, type DomainResult } from '$lib/workflow/errors';
import { loadActor, recordAudit } from './audit';
import { inResultTransaction } from '../db/transaction';

/** Lowest and highest channel-centre frequencies over all spectral windows, Hz. */
export function computeFreqCoverageHz(summary: ObservationSummary): { min: number; max: number } | null {
	let min = Infinity;
	let max = -Infinity;
	for (const spw of summary.spectral_windows) {
		const [lo, hi] = getFreqSpanHz(spw);
		min = Math.min(min, lo);
		max = Math.max(max, hi);
	}
	return Number.isFinite(min) && Number.isFinite(max) ? { min, max } : null;
}

/** A lead shares a recipe (with at least one saved version) with all teams. */
export async function shareRecipe(db: Executor, input: { recipeId: string; userId: string; now?: Date }): Promise<DomainResult<RecipeShare>> {
	const now = input.now ?? new Date();
	return inResultTransaction(db, async (tx) => {
		const acting = await loadActor(tx, input.userId);
		if (!acting) return fail('unauthenticated', 'Sign in to share recipes.');
		const recipe = await getRecipe(tx, input.recipeId, true);
		if (!recipe || !can(acting.actor, 'recipe.view', { teamId: recipe.teamId })) return fail('not_found', 'No such recipe, or it is not visible to your teams.');
		if (!can(acting.actor, 'recipe.share', { teamId: recipe.teamId })) return fail('forbidden', "Only the team's leads can share its recipes with other teams.");
		const latest = await getLatestVersionNumber(tx, recipe.id);
		if (latest === 0) return fail('conflict', 'This recipe has no saved version yet; save a version first, since other teams fork saved versions.');
		const summary = recipe.observationId ? ((await getObservation(tx, recipe.observationId))?.summary ?? null) : null;
		const coverage = summary ? computeFreqCoverageHz(summary) : null;
		const inserted = await insertRecipeShare(tx, {
			recipeId: recipe.id,
			sharedBy: input.userId,
			arrayName: summary?.array.name ?? null,
			minFreqHz: coverage?.min ?? null,
			maxFreqHz: coverage?.max ?? null,
			now
		});
		if (!inserted) return fail('conflict', 'This recipe is already shared with all teams.');
		await recordAudit(tx, { teamId: recipe.teamId, actorId: input.userId, action: 'recipe.share', subjectType: 'recipe', subjectId: recipe.id, details: { title: recipe.title, latestVersion: latest }, now });
		const share = await getRecipeShare(tx, recipe.id);
		if (!share) throw new Error('share vanished inside its own transaction');
		return { ok: true, value: share };
	});
}

/** A lead withdraws a shared recipe; forks made from it stay in their teams. */
export async function withdrawShare(db: Executor, input: { recipeId: string; userId: string; now?: Date }): Promise<DomainResult<{ recipeId: string }>> {
	const now = input.now ?? new Date();
	return inResultTransaction(db, async (tx) => {
		const acting = await loadActor(tx, input.userId);
		if (!acting) return fail('unauthenticated', 'Sign in to change sharing.');
		const recipe = await getRecipe(tx, input.recipeId, true);
		if (!recipe || !can(acting.actor, 'recipe.view', { teamId: recipe.teamId })) return fail('not_found', 'No such recipe, or it is not visible to your teams.');
		if (!can(acting.actor, 'recipe.share', { teamId: recipe.teamId })) return fail('forbidden', "Only the team's leads can withdraw a shared recipe.");
		if (!(await deleteRecipeShare(tx, recipe.id))) return fail('conflict', 'This recipe is not shared, so there is nothing to withdraw.');
		await recordAudit(tx, { teamId: recipe.teamId, actorId: input.userId, action: 'recipe.unshare', subjectType: 'recipe', subjectId: recipe.id, details: { title: recipe.title }, now });
		return { ok: true, value: { recipeId: recipe.id } };
	});
}

/** Whether (and by whom, since when) a recipe is shared. */
export function getShare(db: Executor, recipeId: string): Promise<RecipeShare | null> {
	return getRecipeShare(db, recipeId);
}

const optionalHz = z.number({ message: 'Give the frequency in Hz as a number.' }).positive({ message: 'A frequency is positive (Hz).' }).finite().nullish();

/** The Shared page's query (also the API route's); one definition, imported by both. */
export const sharedQuerySchema = z
	.object({
		text: z.string().max(200, { message: 'Search text is at most 200 characters.' }).default(''),
		array: z.string().max(200, { message: 'An array name is at most 200 characters.' }).nullish(),
		minFreqHz: optionalHz,
		maxFreqHz: optionalHz,
		approvedOnly: z.boolean().default(false),
		cursor: z.string().max(200).nullish(),
		limit: z.number().int().min(1, { message: 'Ask for at least 1 recipe.' }).max(100, { message: 'Ask for at most 100 recipes a page.' }).default(20)
	})
	.refine((q) => q.minFreqHz == null || q.maxFreqHz == null || q.minFreqHz <= q.maxFreqHz, {
		message: 'The lowest frequency is above the highest: swap them.',
		path: ['minFreqHz']
	});
export type SharedQuery = z.input<typeof sharedQuerySchema>;

export type SharedListItem = Omit<SharedRecipeItem, 'position'>;

function encodeCursor(p: SharedRecipeItem['position']): string {
	return Buffer.from(`${p.sharedAtMicros}:${p.recipeId}`, 'utf8').toString('base64url');
}

function decodeCursor(cursor: string): SharedRecipeItem['position'] | null {
	const m = /^(\d{1,19}):([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})$/.exec(Buffer.from(cursor, 'base64url').toString('utf8'));
	return m && m[1] && m[2] ? { sharedAtMicros: m[1], recipeId: m[2] } : null;
}

/** Shared recipes of every team with search and filters, newest share first, `{ items, nextCursor }`. */
export async function listShared(db: Executor, query: SharedQuery): Promise<DomainResult<{ items: SharedListItem[]; nextCursor: string | null }>> {
	const parsed = sharedQuerySchema.safeParse(query);
	if (!parsed.success) {
		return fail('validation_failed', 'The search of shared recipes is not valid.', parsed.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })));
	}
	const q = parsed.data;
	const after = q.cursor ? decodeCursor(q.cursor) : null;
	if (q.cursor && !after) return fail('validation_failed', 'The page cursor is not one this list handed out; start again from the first page.', [{ path: 'cursor', message: 'unknown cursor' }]);
	const rows = await listSharedRecipes(db, {
		text: q.text.trim(),
		arrayName: q.array && q.array.trim() !== '' ? q.array.trim() : null,
		minFreqHz: q.minFreqHz ?? null,
		maxFreqHz: q.maxFreqHz ?? null,
		approvedOnly: q.approvedOnly,
		after,
		limit: q.limit + 1
	});
	const page = rows.slice(0, q.limit);
	const last = page[page.length - 1];
	return {
		ok: true,
		value: { items: page.map(({ position: _p, ...item }) => item), nextCursor: rows.length > q.limit && last ? encodeCursor(last.position) : null }
	};
}

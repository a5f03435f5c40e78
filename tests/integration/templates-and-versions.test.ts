import { describe, expect, it } from 'vitest';
import { inRollback } from './db';
import { seedDemo } from '../../src/lib/server/services/seed';
import { syncStarterTemplates, templateFilesSha256 } from '../../src/lib/server/services/templates';
import { STARTER_FILES, STARTER_TEMPLATE_NAME } from '../../src/lib/server/templates/starter';
import { createRecipe, rerenderVersion, saveVersion } from '../../src/lib/server/services/recipes';
import { getRecipe, getRecipeVersion } from '../../src/lib/server/db/queries/recipes';
import { listObservations } from '../../src/lib/server/db/queries/observations';
import { getTeamBySlug } from '../../src/lib/server/db/queries/teams';
import { recipeVersions, templateVersions } from '../../src/lib/server/db/schema';
import { textSha256 } from '../../src/lib/script/sha256';
import type { Executor } from '../../src/lib/server/db/client';
import { eq, sql } from 'drizzle-orm';

const NOW = new Date('2026-12-01T12:00:00Z');

async function demoRecipe(tx: Executor) {
	await seedDemo(tx);
	const team = await getTeamBySlug(tx, 'stellar-nurseries');
	if (!team) throw new Error('no team');
	const [obs] = await listObservations(tx, team.id);
	if (!obs) throw new Error('no demo observation');
	const r = await createRecipe(tx, { teamId: team.id, observationId: obs.id, userId: null });
	if (!r.ok) throw new Error(r.error.message);
	return r.value.id;
}

describe('template store', () => {
	it('stores the starter set once and adds a version only when its content changes', async () => {
		await inRollback(async (tx) => {
			const first = await syncStarterTemplates(tx, 'starter-test', STARTER_FILES);
			expect(first.created).toBe(true);
			expect(first.version.version).toBe(1);
			const again = await syncStarterTemplates(tx, 'starter-test', STARTER_FILES);
			expect(again.created).toBe(false);
			expect(again.version.id).toBe(first.version.id);
			const changed = { ...STARTER_FILES, 'partials/common.hbs': `${STARTER_FILES['partials/common.hbs'] ?? ''}\n# changed\n` };
			const second = await syncStarterTemplates(tx, 'starter-test', changed);
			expect(second.created).toBe(true);
			expect(second.version.version).toBe(2);
			expect(second.version.sha256).not.toBe(first.version.sha256);
			expect(second.version.sha256).toBe(templateFilesSha256(changed));
		});
	});

	it('refuses to change a stored template version (immutable at the database level)', async () => {
		await inRollback(async (tx) => {
			const { version } = await syncStarterTemplates(tx, 'starter-test', STARTER_FILES);
			await tx.execute(sql`savepoint s1`);
			const err = await tx.update(templateVersions).set({ changelog: 'rewritten' }).where(eq(templateVersions.id, version.id)).then(() => null, (e: { cause?: Error }) => e);
			expect(String(err?.cause?.message)).toMatch(/template_versions rows are immutable/);
			await tx.execute(sql`rollback to savepoint s1`);
		});
	});

	it('refuses starter templates that do not compile', async () => {
		await inRollback(async (tx) => {
			await expect(syncStarterTemplates(tx, 'broken', { 'python/calibrate.py.hbs': 'X = {{{raw}}}' })).rejects.toThrow(/do not compile/);
		});
	});
});

describe('recipe versions', () => {
	it('saves the demo default recipe as version 1 with a rendered program, pinned template and hashes', async () => {
		await inRollback(async (tx) => {
			const id = await demoRecipe(tx);
			const r = await saveVersion(tx, { recipeId: id, userId: null, message: 'First plan', now: NOW });
			expect(r.ok ? null : r.error).toBeNull();
			const v = await getRecipeVersion(tx, id, 1);
			expect(v?.program).toContain('# --- parameters ---');
			expect(v?.programSha256).toBe(textSha256(v?.program ?? ''));
			expect(r.ok && r.value.template.name).toBe(STARTER_TEMPLATE_NAME);
			expect((await getRecipe(tx, id))?.draftRevision).toBe(2);
		});
	});

	it('re-renders an old version with its pinned template to the same bytes', async () => {
		await inRollback(async (tx) => {
			const id = await demoRecipe(tx);
			await saveVersion(tx, { recipeId: id, userId: null, message: 'v1', now: NOW });
			const v = await getRecipeVersion(tx, id, 1);
			const recipe = await getRecipe(tx, id);
			if (!v || !recipe) throw new Error('missing');
			const again = await rerenderVersion(tx, { recipeId: id, version: 1, params: v.params, templateVersionId: v.templateVersionId, observationId: recipe.observationId });
			expect(again.ok && again.value === v.program).toBe(true);
		});
	});

	it('refuses a version whose findings contain errors, keeping the draft', async () => {
		await inRollback(async (tx) => {
			const id = await demoRecipe(tx);
			const recipe = await getRecipe(tx, id);
			if (!recipe) throw new Error('missing');
			const broken = { ...recipe.draft, reference_antenna: { primary: 'NO-SUCH-ANTENNA', fallbacks: [] } };
			const r = await saveVersion(tx, { recipeId: id, userId: null, message: 'bad', params: broken, now: NOW });
			expect(r.ok ? null : r.error.code).toBe('validation_failed');
			expect(r.ok ? [] : (r.error.issues ?? []).map((i) => i.message).join(' ')).toMatch(/refant\.unknown/);
			expect(await tx.select().from(recipeVersions).where(eq(recipeVersions.recipeId, id))).toHaveLength(0);
			expect((await getRecipe(tx, id))?.draftRevision).toBe(1);
		});
	});

	it('refuses a save based on a stale revision (no silent overwrite)', async () => {
		await inRollback(async (tx) => {
			const id = await demoRecipe(tx);
			expect((await saveVersion(tx, { recipeId: id, userId: null, message: 'a', baseRevision: 1, now: NOW })).ok).toBe(true);
			const second = await saveVersion(tx, { recipeId: id, userId: null, message: 'b', baseRevision: 1, now: NOW });
			expect(second.ok ? null : second.error.code).toBe('conflict');
		});
	});

	it('keeps saved versions immutable', async () => {
		await inRollback(async (tx) => {
			const id = await demoRecipe(tx);
			await saveVersion(tx, { recipeId: id, userId: null, message: 'v1', now: NOW });
			await tx.execute(sql`savepoint s2`);
			const err = await tx.update(recipeVersions).set({ message: 'edited' }).where(eq(recipeVersions.recipeId, id)).then(() => null, (e: { cause?: Error }) => e);
			expect(String(err?.cause?.message)).toMatch(/recipe_versions rows are immutable/);
			await tx.execute(sql`rollback to savepoint s2`);
		});
	});
});

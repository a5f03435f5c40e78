import { NOW, later, setUpDemoTeams } from './fixtures';
import { describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { inRollback } from './db';
import { createRecipe, saveVersion } from '../../src/lib/server/services/recipes';
import { uploadObservation } from '../../src/lib/server/services/observations';
import { listShared, shareRecipe, withdrawShare } from '../../src/lib/server/services/sharing';
import { forkVersion, getCompareTarget, getLineage } from '../../src/lib/server/services/forks';
import { decideReview, submitForReview } from '../../src/lib/server/services/reviews';
import { listAudit } from '../../src/lib/server/services/audit';
import { syncStarterTemplates } from '../../src/lib/server/services/templates';
import { STARTER_FILES, STARTER_TEMPLATE_NAME } from '../../src/lib/server/templates/starter';
import { getRecipe, getRecipeVersion } from '../../src/lib/server/db/queries/recipes';
import { getObservation, listObservations } from '../../src/lib/server/db/queries/observations';
import { setRulePolicy } from '../../src/lib/server/db/queries/teams';
import { recipes } from '../../src/lib/server/db/schema';
import { createDemoObservation } from '../../src/lib/calibration/demo-observation';
import type { Executor } from '../../src/lib/server/db/client';


async function setUp(tx: Executor) {
	return setUpDemoTeams(tx, { title: 'Nursery L-band calibration' });
}

// A second invented observation in the other team: another array at 4.0–4.5 GHz.
async function otherTeamRecipe(tx: Executor, teamId: string, userId: string) {
	const summary = createDemoObservation();
	summary.name = 'Tidewater flare watch (invented)';
	summary.array.name = 'Harrow Ridge Array';
	summary.spectral_windows = summary.spectral_windows.map((w) => ({ ...w, first_freq_hz: 4.0e9 }));
	const up = await uploadObservation(tx, { teamId, bytes: new TextEncoder().encode(JSON.stringify(summary)), filename: 'harrow.json', userId });
	if (!up.ok) throw new Error(up.error.message);
	const r = await createRecipe(tx, { teamId, observationId: up.value.id, title: 'Flare watch C-band', userId });
	if (!r.ok) throw new Error(r.error.message);
	const saved = await saveVersion(tx, { recipeId: r.value.id, userId, message: 'v1', now: NOW });
	if (!saved.ok) throw new Error(saved.error.message);
	return r.value.id;
}

describe('sharing a recipe with all teams', () => {
	it('lets a lead share and withdraw, records both in the audit log, and refuses others', async () => {
		await inRollback(async (tx) => {
			const { team, people, recipeId, save } = await setUp(tx);
			const noVersion = await shareRecipe(tx, { recipeId, userId: people.lena });
			expect(noVersion.ok ? null : noVersion.error.message).toMatch(/no saved version yet/);
			await save(recipeId, people.ada, 'v1');
			for (const who of [people.ada, people.ravi]) {
				const r = await shareRecipe(tx, { recipeId, userId: who });
				expect(r.ok ? null : r.error.code).toBe('forbidden');
			}
			const foreign = await shareRecipe(tx, { recipeId, userId: people.tomas });
			expect(foreign.ok ? null : foreign.error.code).toBe('not_found');
			const shared = await shareRecipe(tx, { recipeId, userId: people.lena, now: later(1) });
			expect(shared.ok && shared.value.sharedBy).toBe(people.lena);
			const twice = await shareRecipe(tx, { recipeId, userId: people.lena });
			expect(twice.ok ? null : twice.error.code).toBe('conflict');
			expect((await withdrawShare(tx, { recipeId, userId: people.ravi })).ok).toBe(false);
			expect((await withdrawShare(tx, { recipeId, userId: people.lena, now: later(2) })).ok).toBe(true);
			const none = await withdrawShare(tx, { recipeId, userId: people.lena });
			expect(none.ok ? null : none.error.message).toMatch(/not shared/);
			const audit = await listAudit(tx, team.id);
			expect(audit.ok && audit.value.items.filter((a) => a.action.includes('share')).map((a) => [a.action, a.subjectId])).toEqual([
				['recipe.unshare', recipeId],
				['recipe.share', recipeId]
			]);
		});
	});

	it('lists shared recipes with text, array, frequency and approved-only filters', async () => {
		await inRollback(async (tx) => {
			const { other, people, recipeId, save } = await setUp(tx);
			const v1 = await save(recipeId, people.ada, 'v1');
			const flare = await otherTeamRecipe(tx, other.id, people.tomas);
			expect((await shareRecipe(tx, { recipeId, userId: people.lena, now: later(1) })).ok).toBe(true);
			expect((await shareRecipe(tx, { recipeId: flare, userId: people.tomas, now: later(2) })).ok).toBe(true);
			const ids = async (q: Parameters<typeof listShared>[1]) => {
				const r = await listShared(tx, q);
				if (!r.ok) throw new Error(r.error.message);
				return r.value.items.map((i) => i.recipeId);
			};
			expect(await ids({})).toEqual([flare, recipeId]);
			expect(await ids({ text: 'l-band' })).toEqual([recipeId]);
			expect(await ids({ text: 'tidewater' })).toEqual([flare]);
			expect(await ids({ array: 'corrie flats array' })).toEqual([recipeId]);
			expect(await ids({ array: 'Corrie' })).toEqual([]);
			// Ranges inside, across and outside the two observations' coverage (1.0–1.5 and 4.0–4.5 GHz).
			expect(await ids({ minFreqHz: 1.2e9, maxFreqHz: 1.3e9 })).toEqual([recipeId]);
			expect(await ids({ minFreqHz: 1.4e9, maxFreqHz: 4.1e9 })).toEqual([flare, recipeId]);
			expect(await ids({ minFreqHz: 2.0e9, maxFreqHz: 3.0e9 })).toEqual([]);
			expect(await ids({ minFreqHz: 4.2e9 })).toEqual([flare]);
			expect(await ids({ approvedOnly: true })).toEqual([]);
			await submitForReview(tx, { versionId: v1.id, userId: people.ada });
			await decideReview(tx, { versionId: v1.id, userId: people.ravi, decision: 'approve' });
			expect(await ids({ approvedOnly: true })).toEqual([recipeId]);
			const listed = await listShared(tx, { approvedOnly: true });
			expect(listed.ok && listed.value.items[0]).toMatchObject({ arrayName: 'Corrie Flats Array', newestApprovedVersion: 1, latestVersion: 1, teamName: 'Stellar Nurseries Survey' });
		});
	});

	it('pages with a cursor and rejects bad queries with the reason', async () => {
		await inRollback(async (tx) => {
			const { other, people, recipeId, save } = await setUp(tx);
			await save(recipeId, people.ada, 'v1');
			const flare = await otherTeamRecipe(tx, other.id, people.tomas);
			await shareRecipe(tx, { recipeId, userId: people.lena, now: later(1) });
			await shareRecipe(tx, { recipeId: flare, userId: people.tomas, now: later(2) });
			const first = await listShared(tx, { limit: 1 });
			if (!first.ok) throw new Error(first.error.message);
			expect(first.value.items.map((i) => i.recipeId)).toEqual([flare]);
			expect(first.value.nextCursor).not.toBeNull();
			const second = await listShared(tx, { limit: 1, cursor: first.value.nextCursor });
			expect(second.ok && second.value.items.map((i) => i.recipeId)).toEqual([recipeId]);
			expect(second.ok && second.value.nextCursor).toBeNull();
			const badCursor = await listShared(tx, { cursor: 'bm9wZQ' });
			expect(badCursor.ok ? null : badCursor.error.message).toMatch(/cursor/);
			const swapped = await listShared(tx, { minFreqHz: 2e9, maxFreqHz: 1e9 });
			expect(swapped.ok ? null : swapped.error.issues?.[0]?.message).toMatch(/swap them/);
			const tooMany = await listShared(tx, { limit: 1000 });
			expect(tooMany.ok ? null : tooMany.error.code).toBe('validation_failed');
		});
	});
});

describe('forks', () => {
	it('forks a shared version into another team with the same parameters, the same pinned template and forked_from', async () => {
		await inRollback(async (tx) => {
			const { team, other, people, observationId, recipeId, save } = await setUp(tx);
			const v1 = await save(recipeId, people.ada, 'v1');
			await shareRecipe(tx, { recipeId, userId: people.lena });
			// A newer starter version appears after v1 was saved: the fork must not take it.
			const changed = { ...STARTER_FILES, 'partials/common.hbs': `${STARTER_FILES['partials/common.hbs'] ?? ''}\n# newer starter\n` };
			const newer = await syncStarterTemplates(tx, STARTER_TEMPLATE_NAME, changed);
			expect(newer.version.id).not.toBe(v1.templateVersionId);

			const fork = await forkVersion(tx, { sourceRecipeId: recipeId, version: 1, targetTeamId: other.id, userId: people.ines, now: later(1) });
			if (!fork.ok) throw new Error(fork.error.message);
			const forked = await getRecipe(tx, fork.value.recipeId);
			const fv1 = await getRecipeVersion(tx, fork.value.recipeId, 1);
			expect(forked?.teamId).toBe(other.id);
			expect(fv1?.templateVersionId).toBe(v1.templateVersionId);
			expect(fv1?.params).toEqual(v1.params);
			expect(fv1?.paramsSha256).toBe(v1.paramsSha256);
			expect(forked?.draft).toEqual(v1.params);
			const row = await tx.select({ from: recipes.forkedFromRecipeId, version: recipes.forkedFromVersion }).from(recipes).where(eq(recipes.id, fork.value.recipeId));
			expect(row).toEqual([{ from: recipeId, version: 1 }]);
			// The observation is copied into the fork's team as the same bytes.
			const source = await getObservation(tx, observationId);
			const copy = fork.value.observationId ? await getObservation(tx, fork.value.observationId) : null;
			expect(copy?.teamId).toBe(other.id);
			expect(copy?.sha256).toBe(source?.sha256);
			// Both teams' audit logs record it.
			const theirs = await listAudit(tx, other.id);
			expect(theirs.ok && theirs.value.items.map((a) => a.action)).toEqual(['recipe.fork']);
			const ours = await listAudit(tx, team.id);
			expect(ours.ok && ours.value.items.map((a) => a.action)).toContain('recipe.forked_by_other_team');
		});
	});

	it('refuses a fork whose version has errors under the target team\'s rule policy, storing nothing', async () => {
		await inRollback(async (tx) => {
			const { other, people, recipeId, save } = await setUp(tx);
			const v1 = await save(recipeId, people.ada, 'v1');
			await shareRecipe(tx, { recipeId, userId: people.lena });
			const note = v1.findings.find((f) => f.severity === 'note');
			if (!note) throw new Error('the demo recipe was expected to carry a note finding');
			await setRulePolicy(tx, other.id, { overrides: { [note.code]: 'error' } });
			const before = (await tx.select().from(recipes)).length;
			expect(await listObservations(tx, other.id)).toHaveLength(0);
			const r = await forkVersion(tx, { sourceRecipeId: recipeId, version: 1, targetTeamId: other.id, userId: people.ines });
			expect(r.ok ? null : r.error.code).toBe('validation_failed');
			expect(r.ok ? '' : r.error.message).toMatch(/Under Tidewater Transients's rules this version has 1 error finding/);
			expect(r.ok ? [] : (r.error.issues ?? []).map((i) => i.message.split(':')[0])).toEqual([note.code]);
			expect((await tx.select().from(recipes)).length).toBe(before);
			// The observation copied before the check was rolled back with the rest.
			expect(await listObservations(tx, other.id)).toHaveLength(0);
		});
	});

	it('reuses the team\'s copy of the observation on a second fork', async () => {
		await inRollback(async (tx) => {
			const { other, people, recipeId, save } = await setUp(tx);
			await save(recipeId, people.ada, 'v1');
			await shareRecipe(tx, { recipeId, userId: people.lena });
			const a = await forkVersion(tx, { sourceRecipeId: recipeId, version: 1, targetTeamId: other.id, userId: people.ines });
			const b = await forkVersion(tx, { sourceRecipeId: recipeId, version: 1, targetTeamId: other.id, userId: people.tomas });
			if (!a.ok || !b.ok) throw new Error('fork failed');
			expect(b.value.observationId).toBe(a.value.observationId);
			expect(b.value.recipeId).not.toBe(a.value.recipeId);
		});
	});

	it('refuses forks of unshared recipes of other teams, into teams one is not in, and of missing versions', async () => {
		await inRollback(async (tx) => {
			const { team, other, people, recipeId, save } = await setUp(tx);
			await save(recipeId, people.ada, 'v1');
			const unshared = await forkVersion(tx, { sourceRecipeId: recipeId, version: 1, targetTeamId: other.id, userId: people.ines });
			expect(unshared.ok ? null : unshared.error.code).toBe('not_found');
			// Within the own team an unshared recipe can be forked (e.g. to try a variant).
			const own = await forkVersion(tx, { sourceRecipeId: recipeId, version: 1, targetTeamId: team.id, userId: people.ada });
			expect(own.ok).toBe(true);
			await shareRecipe(tx, { recipeId, userId: people.lena });
			const wrongTeam = await forkVersion(tx, { sourceRecipeId: recipeId, version: 1, targetTeamId: team.id, userId: people.ines });
			expect(wrongTeam.ok ? null : wrongTeam.error.code).toBe('forbidden');
			const missing = await forkVersion(tx, { sourceRecipeId: recipeId, version: 7, targetTeamId: other.id, userId: people.ines });
			expect(missing.ok ? null : missing.error.message).toMatch(/has no version 7/);
		});
	});

	it('traces lineage over forks of forks and hides upstreams the viewer cannot see', async () => {
		await inRollback(async (tx) => {
			const { team, other, people, recipeId, save } = await setUp(tx);
			await save(recipeId, people.ada, 'v1');
			await shareRecipe(tx, { recipeId, userId: people.lena });
			const first = await forkVersion(tx, { sourceRecipeId: recipeId, version: 1, targetTeamId: other.id, userId: people.ines });
			if (!first.ok) throw new Error(first.error.message);
			await shareRecipe(tx, { recipeId: first.value.recipeId, userId: people.tomas });
			const second = await forkVersion(tx, { sourceRecipeId: first.value.recipeId, version: 1, targetTeamId: team.id, userId: people.ada });
			if (!second.ok) throw new Error(second.error.message);
			const lineage = await getLineage(tx, second.value.recipeId);
			expect(lineage.ok && lineage.value.chain.map((e) => [e.recipeId, e.forkedFrom, e.teamName])).toEqual([
				[second.value.recipeId, { recipeId: first.value.recipeId, version: 1 }, 'Stellar Nurseries Survey'],
				[first.value.recipeId, { recipeId, version: 1 }, 'Tidewater Transients'],
				[recipeId, null, 'Stellar Nurseries Survey']
			]);
			expect(lineage.ok && lineage.value.complete).toBe(true);
			// Once the original is withdrawn, Inès (other team) no longer sees it in her fork's lineage.
			await withdrawShare(tx, { recipeId, userId: people.lena });
			const seen = await getLineage(tx, first.value.recipeId, { viewerId: people.ines });
			expect(seen.ok && seen.value.chain.map((e) => e.recipeId)).toEqual([first.value.recipeId]);
			expect(seen.ok && seen.value.complete).toBe(false);
		});
	});

	it('compares a fork with the forked version until the upstream has a newer approved version', async () => {
		await inRollback(async (tx) => {
			const { other, people, recipeId, save } = await setUp(tx);
			await save(recipeId, people.ada, 'v1');
			await shareRecipe(tx, { recipeId, userId: people.lena });
			const fork = await forkVersion(tx, { sourceRecipeId: recipeId, version: 1, targetTeamId: other.id, userId: people.ines });
			if (!fork.ok) throw new Error(fork.error.message);
			const before = await getCompareTarget(tx, fork.value.recipeId);
			expect(before.ok && before.value).toEqual({ recipeId, version: 1, reason: 'forked_version', newerThanFork: false });
			const v2 = await save(recipeId, people.ada, 'v2');
			await submitForReview(tx, { versionId: v2.id, userId: people.ada });
			await decideReview(tx, { versionId: v2.id, userId: people.ravi, decision: 'approve' });
			const after = await getCompareTarget(tx, fork.value.recipeId, { viewerId: people.ines });
			expect(after.ok && after.value).toEqual({ recipeId, version: 2, reason: 'newest_approved', newerThanFork: true });
			const notAFork = await getCompareTarget(tx, recipeId);
			expect(notAFork.ok && notAFork.value).toBeNull();
		});
	});
});

import { describe, expect, it } from 'vitest';
import { inRollback } from './db';
import { seedDemo } from '../../src/lib/server/services/seed';
import { createRecipe, saveVersion } from '../../src/lib/server/services/recipes';
import { updateRulePolicy } from '../../src/lib/server/services/rule-policy';
import { getRecipe } from '../../src/lib/server/db/queries/recipes';
import { listObservations } from '../../src/lib/server/db/queries/observations';
import { getRulePolicy, getTeamBySlug } from '../../src/lib/server/db/queries/teams';
import type { RecipeParams } from '../../src/lib/calibration/recipe';

const NOW = new Date('2026-12-01T12:00:00Z');

/** The demo recipe with a provisional phase interval of two integrations (shorter than the bandpass scan). */
function withShortPrep(p: RecipeParams): RecipeParams {
	return { ...p, steps: p.steps.map((s) => (s.kind === 'bandpass_prep' ? { ...s, interval: { mode: 'seconds' as const, seconds: 16 } } : s)) };
}

describe('team rule policy', () => {
	it('lets a lead relax the provisional-phase interval rule to a warning, and findings say so', async () => {
		await inRollback(async (tx) => {
			await seedDemo(tx);
			const team = await getTeamBySlug(tx, 'stellar-nurseries');
			if (!team) throw new Error('no team');
			const [obs] = await listObservations(tx, team.id);
			const created = await createRecipe(tx, { teamId: team.id, observationId: obs?.id ?? '', userId: null });
			if (!created.ok) throw new Error(created.error.message);
			const draft = (await getRecipe(tx, created.value.id))?.draft;
			if (!draft) throw new Error('no draft');

			const refused = await saveVersion(tx, { recipeId: created.value.id, userId: null, message: 'short prep', params: withShortPrep(draft), now: NOW });
			expect(refused.ok ? '' : (refused.error.issues ?? []).map((i) => i.message).join(' ')).toMatch(/prep\.interval_shorter_than_scan/);

			expect((await updateRulePolicy(tx, team.id, { overrides: { 'prep.interval_shorter_than_scan': 'warning' } })).ok).toBe(true);
			const saved = await saveVersion(tx, { recipeId: created.value.id, userId: null, message: 'short prep', params: withShortPrep(draft), now: NOW });
			expect(saved.ok).toBe(true);
			const f = saved.ok ? saved.value.findings.find((x) => x.code === 'prep.interval_shorter_than_scan') : undefined;
			expect(f?.severity).toBe('warning');
			expect(f?.policy).toEqual({ from: 'error', to: 'warning' });
		});
	});

	it('refuses a policy naming an unknown rule, and keeps the old policy', async () => {
		await inRollback(async (tx) => {
			await seedDemo(tx);
			const team = await getTeamBySlug(tx, 'stellar-nurseries');
			if (!team) throw new Error('no team');
			const r = await updateRulePolicy(tx, team.id, { overrides: { 'no.such_rule': 'off' } });
			expect(r.ok ? null : r.error.code).toBe('validation_failed');
			expect(await getRulePolicy(tx, team.id)).toEqual({ overrides: {} });
		});
	});
});

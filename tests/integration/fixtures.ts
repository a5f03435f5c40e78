import { seedDemo } from '../../src/lib/server/services/seed';
import { createRecipe, saveVersion } from '../../src/lib/server/services/recipes';
import { getRecipeVersion } from '../../src/lib/server/db/queries/recipes';
import { listObservations } from '../../src/lib/server/db/queries/observations';
import { getTeamBySlug } from '../../src/lib/server/db/queries/teams';
import { findUserByEmail } from '../../src/lib/server/db/queries/users';
import type { Executor } from '../../src/lib/server/db/client';

export const NOW = new Date('2026-12-01T12:00:00Z');
export const later = (minutes: number): Date => new Date(NOW.getTime() + minutes * 60_000);

/**
 * The invented demo teams (services/seed.ts) with one recipe of the demo team on its demo
 * observation: Stellar Nurseries (Ada member, Ravi reviewer, Lena lead) and Tidewater
 * Transients (Tomás lead, Inès member). `save` stores the recipe's draft as its next version.
 */
export async function setUpDemoTeams(tx: Executor, opts: { title?: string } = {}) {
	await seedDemo(tx);
	const team = await getTeamBySlug(tx, 'stellar-nurseries');
	const other = await getTeamBySlug(tx, 'tidewater-transients');
	if (!team || !other) throw new Error('seed did not create the demo teams');
	const person = async (email: string) => {
		const u = await findUserByEmail(tx, email);
		if (!u) throw new Error(`no ${email}`);
		return u.id;
	};
	const people = {
		ada: await person('ada@stellar-nurseries.example'),
		ravi: await person('ravi@stellar-nurseries.example'),
		lena: await person('lena@stellar-nurseries.example'),
		tomas: await person('tomas@tidewater.example'),
		ines: await person('ines@tidewater.example')
	};
	const [obs] = await listObservations(tx, team.id);
	if (!obs) throw new Error('no demo observation');
	const recipe = await createRecipe(tx, { teamId: team.id, observationId: obs.id, ...(opts.title ? { title: opts.title } : {}), userId: people.ada });
	if (!recipe.ok) throw new Error(recipe.error.message);
	const save = async (recipeId: string, userId: string, message: string) => {
		const r = await saveVersion(tx, { recipeId, userId, message, now: NOW });
		if (!r.ok) throw new Error(r.error.message);
		const v = await getRecipeVersion(tx, recipeId, r.value.version);
		if (!v) throw new Error('saved version not found');
		return v;
	};
	return { team, other, people, observationId: obs.id, recipeId: recipe.value.id, save };
}

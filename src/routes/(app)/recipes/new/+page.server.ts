import { fail, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { z } from 'zod';
import { getDb } from '$lib/server/db/client';
import { listObservations } from '$lib/server/db/queries/observations';
import { actorOf, requireCan, requirePageUser } from '$lib/server/guards';
import { createRecipe, importRecipe } from '$lib/server/services/recipes';
import { can } from '$lib/workflow/permissions';

export type NewRecipeData = {
	teams: { id: string; name: string; observations: { id: string; name: string; array: string; createdAt: string }[] }[];
	preselect: string | null;
};

export const load: PageServerLoad = async (event): Promise<NewRecipeData> => {
	const user = requirePageUser(event);
	const actor = actorOf(user);
	const teams = user.memberships.filter((m) => can(actor, 'recipe.create', { teamId: m.teamId }));
	return {
		teams: await Promise.all(
			teams.map(async (t) => ({
				id: t.teamId,
				name: t.teamName,
				observations: (await listObservations(getDb(), t.teamId)).map((o) => ({ id: o.id, name: o.name, array: o.summary.array.name, createdAt: o.createdAt.toISOString() }))
			}))
		),
		preselect: event.url.searchParams.get('observation')
	};
};

const createSchema = z.object({
	choice: z.string().regex(/^[0-9a-f-]{36}\|[0-9a-f-]{36}$/, 'Choose an observation.'),
	title: z.string().trim().max(200, 'Keep the title under 200 characters.').default('')
});

export const actions: Actions = {
	create: async (event) => {
		const form = await event.request.formData();
		const parsed = createSchema.safeParse({ choice: form.get('choice') ?? '', title: form.get('title') ?? '' });
		if (!parsed.success) return fail(400, { action: 'create', message: parsed.error.issues.map((i) => i.message).join(' '), issues: [] as { path: string; message: string }[] });
		const [teamId, observationId] = parsed.data.choice.split('|') as [string, string];
		const user = requireCan(event, 'recipe.create', { teamId }, 'team.view');
		const r = await createRecipe(getDb(), { teamId, observationId, ...(parsed.data.title ? { title: parsed.data.title } : {}), userId: user.id });
		if (!r.ok) return fail(400, { action: 'create', message: r.error.message, issues: [] as { path: string; message: string }[] });
		redirect(303, `/recipes/${r.value.id}/edit/roles`);
	},
	import: async (event) => {
		const form = await event.request.formData();
		const teamId = String(form.get('team') ?? '');
		const file = form.get('file');
		if (!z.uuid().safeParse(teamId).success) return fail(400, { action: 'import', message: 'Choose the team to import into.', issues: [] as { path: string; message: string }[] });
		const user = requireCan(event, 'recipe.create', { teamId }, 'team.view');
		if (!(file instanceof File) || file.size === 0) return fail(400, { action: 'import', message: 'Choose a recipe export file (.json).', issues: [] as { path: string; message: string }[] });
		if (file.size > 6_000_000) return fail(400, { action: 'import', message: 'The file is larger than 6 MB; a recipe export is much smaller.', issues: [] as { path: string; message: string }[] });
		const r = await importRecipe(getDb(), { teamId, text: await file.text(), filename: file.name, userId: user.id });
		if (!r.ok) return fail(400, { action: 'import', message: r.error.message, issues: r.error.issues ?? [] });
		redirect(303, `/recipes/${r.value.id}`);
	}
};

import { fail } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { listTeams } from '$lib/server/db/queries/teams';
import { requireAdmin } from '$lib/server/guards';
import { createTeam } from '$lib/server/services/teams';
import { createTeamInputSchema } from '$lib/workflow/team-schemas';

export const load: PageServerLoad = async (event): Promise<{ teams: { id: string; name: string; slug: string; memberCount: number }[] }> => {
	requireAdmin(event);
	return { teams: await listTeams(getDb()) };
};

export const actions: Actions = {
	createTeam: async (event) => {
		requireAdmin(event);
		const form = await event.request.formData();
		const values = { name: String(form.get('name') ?? ''), slug: String(form.get('slug') ?? ''), leadEmail: String(form.get('leadEmail') ?? '') };
		const parsed = createTeamInputSchema.safeParse(values);
		if (!parsed.success) return fail(400, { values, message: parsed.error.issues.map((i) => i.message).join(' ') });
		const r = await createTeam(getDb(), parsed.data);
		if (!r.ok) return fail(409, { values, message: r.error.message });
		return { done: `Team "${r.value.name}" created with ${parsed.data.leadEmail} as its lead.` };
	}
};

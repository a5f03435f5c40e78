import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { findTemplate, listTemplateVersions } from '$lib/server/db/queries/templates';
import { actorOf, requireCan, requirePageUser, requireUser } from '$lib/server/guards';
import { startTeamTemplate } from '$lib/server/services/template-editing';
import { ensureStarterTemplates } from '$lib/server/services/templates';
import { statusFor } from '$lib/server/http';
import { can } from '$lib/workflow/permissions';

type VersionRow = { version: number; sha256: string; changelog: string; author: string; createdAt: string; usedBy: number };

export type TemplatesPageData = {
	sets: { id: string; name: string; scope: string; teamId: string | null; canEdit: boolean; versions: VersionRow[] }[];
	/** Teams in which the person may start a team template (they lead them). */
	leadTeams: { id: string; name: string }[];
};

export const load: PageServerLoad = async (event): Promise<TemplatesPageData> => {
	const user = requirePageUser(event);
	const db = getDb();
	await ensureStarterTemplates(db);
	const actor = actorOf(user);
	const teamName = new Map(user.memberships.map((m) => [m.teamId, m.teamName]));
	const rows = await listTemplateVersions(db, user.memberships.map((m) => m.teamId));
	const sets = new Map<string, TemplatesPageData['sets'][number]>();
	for (const r of rows) {
		const key = `${r.teamId ?? ''}/${r.templateName}`;
		let set = sets.get(key);
		if (!set) {
			const found = await findTemplate(db, r.templateName, r.teamId);
			if (!found) continue; // removed since the list was read
			set = {
				id: found.id,
				name: r.templateName,
				scope: r.teamId === null ? 'starter set' : `team template of ${teamName.get(r.teamId) ?? 'your team'}`,
				teamId: r.teamId,
				// The starter set changes only through the templates/ folder, never here.
				canEdit: r.teamId !== null && can(actor, 'template.manage', { teamId: r.teamId }),
				versions: []
			};
			sets.set(key, set);
		}
		set.versions.push({
			version: r.version,
			sha256: r.sha256,
			changelog: r.changelog,
			author: r.authorEmail ?? 'shipped with Phasewright',
			createdAt: r.createdAt.toISOString(),
			usedBy: r.usedBy
		});
	}
	// The starter set first, then team templates by name.
	const ordered = [...sets.values()].sort((a, b) => (a.teamId === null) !== (b.teamId === null) ? (a.teamId === null ? -1 : 1) : a.name.localeCompare(b.name));
	return {
		sets: ordered,
		leadTeams: user.memberships.filter((m) => can(actor, 'template.manage', { teamId: m.teamId })).map((m) => ({ id: m.teamId, name: m.teamName }))
	};
};

const startInputSchema = z.object({
	teamId: z.uuid({ message: 'Choose the team the template belongs to.' }),
	name: z.string().trim().min(1, { message: 'Give the template a name, e.g. "survey-standard".' })
});

export const actions: Actions = {
	startTemplate: async (event) => {
		requireUser(event);
		const form = await event.request.formData();
		const values = { teamId: String(form.get('teamId') ?? ''), name: String(form.get('name') ?? '') };
		const parsed = startInputSchema.safeParse(values);
		if (!parsed.success) return fail(400, { values, message: parsed.error.issues.map((i) => i.message).join(' ') });
		const user = requireCan(event, 'template.manage', { teamId: parsed.data.teamId });
		const r = await startTeamTemplate(getDb(), { teamId: parsed.data.teamId, name: parsed.data.name, userId: user.id });
		if (!r.ok) return fail(statusFor(r.error.code), { values, message: r.error.message });
		return { done: `Started the team template "${r.value.templateName}": version 1 is a copy of the starter set. Use "New version" to change its files.`, startedId: r.value.templateId };
	}
};

import { error } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { getTeam } from '$lib/server/db/queries/teams';
import { getTemplateVersionById } from '$lib/server/db/queries/templates';
import { requireCan, requirePageUser } from '$lib/server/guards';
import { listAudit } from '$lib/server/services/audit';
import { describeAuditEntry, type AuditDescription } from './describe-audit';

export type AuditPageData = {
	team: { id: string; name: string };
	entries: ({ id: string; who: string; at: string } & AuditDescription)[];
	/** Cursor of the next (older) page, or null on the last page. */
	olderCursor: string | null;
	/** Whether this is a later page (so a link back to the newest entries makes sense). */
	paged: boolean;
};

const PAGE_SIZE = 50;

export const load: PageServerLoad = async (event): Promise<AuditPageData> => {
	requirePageUser(event);
	// Leads only; other teams' logs are not revealed (404).
	requireCan(event, 'audit.view', { teamId: event.params.teamId }, 'team.view');
	const team = await getTeam(getDb(), event.params.teamId);
	if (!team) error(404, { message: 'This team does not exist.', code: 'not_found' });
	const cursor = event.url.searchParams.get('before');
	const page = await listAudit(getDb(), team.id, { cursor, limit: PAGE_SIZE });
	if (!page.ok) error(400, { message: `${page.error.issues?.[0]?.message ?? page.error.message} (the "before" value in the address).`, code: 'validation_failed' });
	// Template versions link to their page; look up which template each belongs to.
	const templateOf = new Map<string, string>();
	for (const e of page.value.items) {
		if (e.subjectType !== 'template_version' || templateOf.has(e.subjectId)) continue;
		const v = await getTemplateVersionById(getDb(), e.subjectId);
		if (v && v.teamId === team.id) templateOf.set(e.subjectId, `/templates/${v.templateId}/versions/${v.version}`);
	}
	return {
		team: { id: team.id, name: team.name },
		entries: page.value.items.map((e) => ({
			id: e.id,
			who: e.actorEmail ?? (e.actorId === null ? 'Phasewright or a removed account' : 'a removed account'),
			at: e.createdAt.toISOString(),
			...describeAuditEntry(e, (id) => templateOf.get(id) ?? null)
		})),
		olderCursor: page.value.nextCursor,
		paged: cursor !== null
	};
};

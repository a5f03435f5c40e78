import type { PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { listTemplateVersions } from '$lib/server/db/queries/templates';
import { requirePageUser } from '$lib/server/guards';
import { ensureStarterTemplates } from '$lib/server/services/templates';

export type TemplatesPageData = {
	versions: { name: string; scope: string; version: number; sha256: string; changelog: string; author: string; createdAt: string; usedBy: number }[];
};

export const load: PageServerLoad = async (event): Promise<TemplatesPageData> => {
	const user = requirePageUser(event);
	await ensureStarterTemplates(getDb());
	const teamName = new Map(user.memberships.map((m) => [m.teamId, m.teamName]));
	const rows = await listTemplateVersions(getDb(), user.memberships.map((m) => m.teamId));
	return {
		versions: rows.map((r) => ({
			name: r.templateName,
			scope: r.teamId === null ? 'starter set' : (teamName.get(r.teamId) ?? 'team'),
			version: r.version,
			sha256: r.sha256,
			changelog: r.changelog,
			author: r.authorEmail ?? 'shipped with Phasewright',
			createdAt: r.createdAt.toISOString(),
			usedBy: r.usedBy
		}))
	};
};

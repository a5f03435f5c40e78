import { error } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { getTemplateVersionByNumber } from '$lib/server/db/queries/templates';
import { actorOf } from '$lib/server/guards';
import { can } from '$lib/workflow/permissions';
import { describeScope, listVersionsOf, loadTemplateFor } from '../../../template-access.server';

export type TemplateVersionPageData = {
	template: { id: string; name: string; scope: string; canEdit: boolean; newest: number };
	version: { number: number; sha256: string; changelog: string; author: string; createdAt: string; usedBy: number };
	/** Every file's path; only the chosen file's text is sent. */
	paths: string[];
	file: { path: string; text: string };
	others: number[];
};

export const load: PageServerLoad = async (event): Promise<TemplateVersionPageData> => {
	const { user, latest, teamName } = await loadTemplateFor(event, event.params.templateId, 'template.view');
	const n = Number(event.params.versionNo);
	const v = n === latest.version ? latest : await getTemplateVersionByNumber(getDb(), latest.templateId, n);
	if (!v) error(404, { message: `Template "${latest.templateName}" has no version ${n}; its newest is version ${latest.version}.`, code: 'not_found' });
	const paths = Object.keys(v.files).sort();
	const asked = event.url.searchParams.get('file');
	if (asked !== null && !paths.includes(asked)) error(404, { message: `Version ${v.version} of "${latest.templateName}" has no file ${JSON.stringify(asked.slice(0, 200))}; choose one from the list of files.`, code: 'not_found' });
	// The entry template first: it is where the program starts.
	const chosen = asked ?? paths.find((p) => p.startsWith('python/')) ?? paths[0] ?? '';
	const all = await listVersionsOf(latest);
	const row = all.find((r) => r.version === v.version);
	return {
		template: {
			id: latest.templateId,
			name: latest.templateName,
			scope: describeScope(teamName),
			canEdit: latest.teamId !== null && can(actorOf(user), 'template.manage', { teamId: latest.teamId }),
			newest: latest.version
		},
		version: {
			number: v.version,
			sha256: v.sha256,
			changelog: v.changelog,
			author: row?.authorEmail ?? (v.authorId === null ? 'shipped with Phasewright' : 'a former user'),
			createdAt: v.createdAt.toISOString(),
			usedBy: row?.usedBy ?? 0
		},
		paths,
		file: { path: chosen, text: v.files[chosen] ?? '' },
		others: all.map((r) => r.version).filter((x) => x !== v.version)
	};
};

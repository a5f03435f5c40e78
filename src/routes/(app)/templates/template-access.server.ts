import { error, type RequestEvent } from '@sveltejs/kit';
import { getDb } from '$lib/server/db/client';
import { getLatestTemplateVersion, listTemplateVersions, type TemplateVersion, type TemplateVersionListItem } from '$lib/server/db/queries/templates';
import { requireCan, requirePageUser, requireUser } from '$lib/server/guards';
import type { SessionUser } from '$lib/server/db/queries/users';
import type { Action } from '$lib/workflow/permissions';

export type TemplateAccess = { user: SessionUser; latest: TemplateVersion; teamName: string | null };

/**
 * The newest version of a template the signed-in person may `action`: sign-in first, then
 * 404 when the template does not exist or belongs to a team they cannot see (its existence
 * is not revealed), 403 when they see it but their role is not enough.
 */
export async function loadTemplateFor(event: Pick<RequestEvent, 'locals' | 'url'>, templateId: string, action: Action, from: 'page' | 'action' = 'page'): Promise<TemplateAccess> {
	// Pages send a signed-out visitor to sign-in; form actions answer 401.
	const user = from === 'page' ? requirePageUser(event) : requireUser(event);
	const latest = await getLatestTemplateVersion(getDb(), templateId);
	if (!latest) error(404, { message: 'Not found, or not visible to your teams.', code: 'not_found' });
	requireCan(event, action, { teamId: latest.teamId }, 'template.view');
	const teamName = latest.teamId === null ? null : (user.memberships.find((m) => m.teamId === latest.teamId)?.teamName ?? 'team');
	return { user, latest, teamName };
}

/** Every version of one template (newest first) with author and use counts, for its pages. */
export async function listVersionsOf(latest: TemplateVersion): Promise<TemplateVersionListItem[]> {
	const rows = await listTemplateVersions(getDb(), latest.teamId === null ? [] : [latest.teamId]);
	return rows.filter((r) => r.templateName === latest.templateName && r.teamId === latest.teamId);
}

/** Where a template version is described on screen, e.g. "standard (starter set)". */
export function describeScope(teamName: string | null): string {
	return teamName === null ? 'starter set' : `team template of ${teamName}`;
}

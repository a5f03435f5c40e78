import { error, fail } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { getRulePolicy, getTeam } from '$lib/server/db/queries/teams';
import { actorOf, requireCan } from '$lib/server/guards';
import { updateRulePolicy } from '$lib/server/services/rule-policy';
import { RULES } from '$lib/calibration/validate';
import { can } from '$lib/workflow/permissions';

export type RulesPageData = {
	team: { id: string; name: string };
	rules: { code: string; severity: string; source: string; why: string; locked: boolean; override: string | null }[];
	canEdit: boolean;
};

export const load: PageServerLoad = async (event): Promise<RulesPageData> => {
	const subject = { teamId: event.params.teamId };
	const user = requireCan(event, 'team.view', subject);
	const team = await getTeam(getDb(), event.params.teamId);
	if (!team) error(404, { message: 'This team does not exist.', code: 'not_found' });
	const policy = (await getRulePolicy(getDb(), team.id)) ?? { overrides: {} };
	return {
		team: { id: team.id, name: team.name },
		rules: RULES.map((r) => ({ code: r.code, severity: r.severity, source: r.source, why: r.why, locked: r.locked === true, override: policy.overrides[r.code] ?? null })),
		canEdit: can(actorOf(user), 'team.set_policy', subject)
	};
};

export const actions: Actions = {
	savePolicy: async (event) => {
		requireCan(event, 'team.set_policy', { teamId: event.params.teamId });
		const form = await event.request.formData();
		const overrides: Record<string, string> = {};
		for (const [key, value] of form.entries()) {
			if (key.startsWith('rule:') && typeof value === 'string' && value !== 'default') overrides[key.slice(5)] = value;
		}
		const r = await updateRulePolicy(getDb(), event.params.teamId, { overrides });
		if (!r.ok) return fail(400, { message: `${r.error.message} ${(r.error.issues ?? []).map((i) => i.message).join('; ')}` });
		const n = Object.keys(r.value.overrides).length;
		return { done: n === 0 ? 'Every rule uses its default severity.' : `Saved: ${n} rule${n === 1 ? '' : 's'} changed from the default for this team.` };
	}
};

import { error, fail } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { getTeam, listMembers } from '$lib/server/db/queries/teams';
import { actorOf, requireCan } from '$lib/server/guards';
import { addMember, changeRole, removeMember } from '$lib/server/services/teams';
import { can, type TeamRole } from '$lib/workflow/permissions';
import { addMemberInputSchema, changeRoleInputSchema, removeMemberInputSchema } from '$lib/workflow/team-schemas';
import { readFormFields, statusFor } from '$lib/server/http';

export type TeamPageData = {
	team: { id: string; name: string };
	members: { userId: string; email: string; name: string | null; role: TeamRole }[];
	canManage: boolean;
	me: string;
};

export const load: PageServerLoad = async (event): Promise<TeamPageData> => {
	const subject = { teamId: event.params.teamId };
	const user = requireCan(event, 'team.view', subject);
	const team = await getTeam(getDb(), event.params.teamId);
	if (!team) error(404, { message: 'This team does not exist.', code: 'not_found' });
	const members = await listMembers(getDb(), team.id);
	return {
		team: { id: team.id, name: team.name },
		members: members.map((m) => ({ userId: m.userId, email: m.email, name: m.name, role: m.role })),
		canManage: can(actorOf(user), 'team.manage_members', subject),
		me: user.id
	};
};

export const actions: Actions = {
	addMember: async (event) => {
		requireCan(event, 'team.manage_members', { teamId: event.params.teamId });
		const values = await readFormFields(event.request);
		const parsed = addMemberInputSchema.safeParse(values);
		if (!parsed.success) return fail(400, { action: 'addMember', values, message: parsed.error.issues.map((i) => i.message).join(' ') });
		const r = await addMember(getDb(), event.params.teamId, parsed.data);
		if (!r.ok) return fail(statusFor(r.error.code), { action: 'addMember', values, message: r.error.message });
		return { action: 'addMember', done: `${r.value.email} is now a ${r.value.role} of the team. They can sign in with that address.` };
	},
	changeRole: async (event) => {
		requireCan(event, 'team.manage_members', { teamId: event.params.teamId });
		const parsed = changeRoleInputSchema.safeParse(await readFormFields(event.request));
		if (!parsed.success) return fail(400, { action: 'changeRole', message: parsed.error.issues.map((i) => i.message).join(' ') });
		const r = await changeRole(getDb(), event.params.teamId, parsed.data.userId, parsed.data.role);
		if (!r.ok) return fail(statusFor(r.error.code), { action: 'changeRole', message: r.error.message });
		return { action: 'changeRole', done: `${r.value.email} is now a ${r.value.role}.` };
	},
	removeMember: async (event) => {
		requireCan(event, 'team.manage_members', { teamId: event.params.teamId });
		const parsed = removeMemberInputSchema.safeParse(await readFormFields(event.request));
		if (!parsed.success) return fail(400, { action: 'removeMember', message: parsed.error.issues.map((i) => i.message).join(' ') });
		const r = await removeMember(getDb(), event.params.teamId, parsed.data.userId);
		if (!r.ok) return fail(statusFor(r.error.code), { action: 'removeMember', message: r.error.message });
		return { action: 'removeMember', done: 'Member removed.' };
	}
};

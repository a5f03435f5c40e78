import type { Executor } from '../db/client';
import { inResultTransaction } from '../db/transaction';
import { insertMembership, listMembers, updateMembershipRole, deleteMembership, getTeam, insertTeam, getTeamBySlug, type TeamMember, type Team } from '../db/queries/teams';
import { upsertUserByEmail, findUserByEmail } from '../db/queries/users';
import { wouldRemoveLastLead, type TeamRole } from '$lib/workflow/permissions';
import { fail, type DomainResult } from '$lib/workflow/errors';
import type { AddMemberInput, CreateTeamInput } from '$lib/workflow/team-schemas';

/** Adds a person (created when new) to a team with a role, in one transaction. */
export async function addMember(db: Executor, teamId: string, input: AddMemberInput): Promise<DomainResult<TeamMember>> {
	return inResultTransaction(db, async (tx) => {
		if (!(await getTeam(tx, teamId))) return fail('not_found', 'This team does not exist.');
		const members = await listMembers(tx, teamId, true);
		if (members.some((m) => m.email === input.email)) {
			return fail('conflict', `${input.email} is already a member of this team; change their role instead.`);
		}
		const user = await upsertUserByEmail(tx, input.email, input.name === '' ? null : input.name);
		await insertMembership(tx, { teamId, userId: user.id, role: input.role });
		const added = (await listMembers(tx, teamId)).find((m) => m.userId === user.id);
		if (!added) throw new Error('membership vanished inside its own transaction');
		return { ok: true, value: added };
	});
}

/** Changes a member's role; a team never loses its last lead. */
export async function changeRole(db: Executor, teamId: string, userId: string, role: TeamRole): Promise<DomainResult<TeamMember>> {
	return inResultTransaction(db, async (tx) => {
		const members = await listMembers(tx, teamId, true);
		const target = members.find((m) => m.userId === userId);
		if (!target) return fail('not_found', 'This person is not a member of the team.');
		if (wouldRemoveLastLead(members, userId, role)) {
			return fail('conflict', 'A team needs at least one lead: make someone else lead first.');
		}
		await updateMembershipRole(tx, teamId, userId, role);
		return { ok: true, value: { ...target, role } };
	});
}

/** Removes a member; a team never loses its last lead. */
export async function removeMember(db: Executor, teamId: string, userId: string): Promise<DomainResult<{ userId: string }>> {
	return inResultTransaction(db, async (tx) => {
		const members = await listMembers(tx, teamId, true);
		if (!members.some((m) => m.userId === userId)) return fail('not_found', 'This person is not a member of the team.');
		if (wouldRemoveLastLead(members, userId, null)) {
			return fail('conflict', 'A team needs at least one lead: make someone else lead before removing this one.');
		}
		await deleteMembership(tx, teamId, userId);
		return { ok: true, value: { userId } };
	});
}

/** Creates a team with its first lead (site admin). */
export async function createTeam(db: Executor, input: CreateTeamInput): Promise<DomainResult<Team>> {
	return inResultTransaction(db, async (tx) => {
		if (await getTeamBySlug(tx, input.slug)) return fail('conflict', `A team with the short name "${input.slug}" exists already.`);
		const team = await insertTeam(tx, { slug: input.slug, name: input.name });
		const lead = (await findUserByEmail(tx, input.leadEmail)) ?? (await upsertUserByEmail(tx, input.leadEmail, null));
		await insertMembership(tx, { teamId: team.id, userId: lead.id, role: 'lead' });
		return { ok: true, value: team };
	});
}

import { describe, expect, it } from 'vitest';
import { inRollback } from './db';
import { seedDemo, DEMO_TEAMS } from '../../src/lib/server/services/seed';
import { addMember, changeRole, removeMember, createTeam } from '../../src/lib/server/services/teams';
import { getTeamBySlug, listMembers } from '../../src/lib/server/db/queries/teams';
import { findUserByEmail } from '../../src/lib/server/db/queries/users';
import { addMemberInputSchema } from '../../src/lib/workflow/team-schemas';
import { users, memberships, teams } from '../../src/lib/server/db/schema';
import type { Executor } from '../../src/lib/server/db/client';

async function demoTeam(tx: Executor) {
	await seedDemo(tx);
	const team = await getTeamBySlug(tx, 'stellar-nurseries');
	if (!team) throw new Error('seed did not create the demo team');
	return team;
}

async function counts(tx: Executor) {
	return {
		users: (await tx.select().from(users)).length,
		memberships: (await tx.select().from(memberships)).length,
		teams: (await tx.select().from(teams)).length
	};
}

describe('demo seed', () => {
	it('creates the demo team with a member, a reviewer and a lead, plus a site admin', async () => {
		await inRollback(async (tx) => {
			const team = await demoTeam(tx);
			const roles = (await listMembers(tx, team.id)).map((m) => m.role).sort();
			expect(roles).toEqual(['lead', 'member', 'reviewer']);
			expect((await findUserByEmail(tx, 'admin@phasewright.example'))?.isAdmin).toBe(true);
		});
	});

	it('changes nothing when run twice', async () => {
		await inRollback(async (tx) => {
			await seedDemo(tx);
			const before = await counts(tx);
			const second = await seedDemo(tx);
			expect(second.created).toBe(0);
			expect(await counts(tx)).toEqual(before);
			expect(before.teams).toBe(DEMO_TEAMS.length);
		});
	});
});

describe('team management', () => {
	it('adds a new person by e-mail as a member, creating their account', async () => {
		await inRollback(async (tx) => {
			const team = await demoTeam(tx);
			const input = addMemberInputSchema.parse({ email: '  New.Person@Example.org ', role: 'reviewer', name: 'New Person' });
			const r = await addMember(tx, team.id, input);
			expect(r.ok).toBe(true);
			const user = await findUserByEmail(tx, 'new.person@example.org');
			expect(user?.name).toBe('New Person');
			expect((await listMembers(tx, team.id)).find((m) => m.email === 'new.person@example.org')?.role).toBe('reviewer');
		});
	});

	it('refuses adding someone who is already a member, and changes nothing', async () => {
		await inRollback(async (tx) => {
			const team = await demoTeam(tx);
			const before = await counts(tx);
			const r = await addMember(tx, team.id, addMemberInputSchema.parse({ email: 'ada@stellar-nurseries.example' }));
			expect(r.ok).toBe(false);
			if (!r.ok) expect(r.error.code).toBe('conflict');
			expect(await counts(tx)).toEqual(before);
		});
	});

	it('refuses demoting or removing the last lead', async () => {
		await inRollback(async (tx) => {
			const team = await demoTeam(tx);
			const lead = (await listMembers(tx, team.id)).find((m) => m.role === 'lead');
			if (!lead) throw new Error('no lead');
			const demote = await changeRole(tx, team.id, lead.userId, 'member');
			expect(demote.ok).toBe(false);
			if (!demote.ok) expect(demote.error.message).toMatch(/at least one lead/);
			const remove = await removeMember(tx, team.id, lead.userId);
			expect(remove.ok).toBe(false);
			expect((await listMembers(tx, team.id)).find((m) => m.userId === lead.userId)?.role).toBe('lead');
		});
	});

	it('allows demoting a lead once another member has become lead', async () => {
		await inRollback(async (tx) => {
			const team = await demoTeam(tx);
			const members = await listMembers(tx, team.id);
			const lead = members.find((m) => m.role === 'lead');
			const reviewer = members.find((m) => m.role === 'reviewer');
			if (!lead || !reviewer) throw new Error('demo roles missing');
			expect((await changeRole(tx, team.id, reviewer.userId, 'lead')).ok).toBe(true);
			expect((await changeRole(tx, team.id, lead.userId, 'member')).ok).toBe(true);
			expect((await removeMember(tx, team.id, lead.userId)).ok).toBe(true);
			expect((await listMembers(tx, team.id)).map((m) => m.userId)).not.toContain(lead.userId);
		});
	});

	it('reports an unknown member as not found', async () => {
		await inRollback(async (tx) => {
			const team = await demoTeam(tx);
			const r = await changeRole(tx, team.id, '00000000-0000-4000-8000-000000000000', 'lead');
			expect(r.ok ? null : r.error.code).toBe('not_found');
		});
	});

	it('creates a team with its first lead and refuses a duplicate short name', async () => {
		await inRollback(async (tx) => {
			const r = await createTeam(tx, { name: 'Pulsar Timing', slug: 'pulsar-timing', leadEmail: 'pia@pulsar.example' });
			expect(r.ok).toBe(true);
			if (!r.ok) return;
			expect((await listMembers(tx, r.value.id)).map((m) => [m.email, m.role])).toEqual([['pia@pulsar.example', 'lead']]);
			const again = await createTeam(tx, { name: 'Other', slug: 'pulsar-timing', leadEmail: 'x@pulsar.example' });
			expect(again.ok ? null : again.error.code).toBe('conflict');
		});
	});
});

import { and, asc, eq } from 'drizzle-orm';
import type { Executor } from '../client';
import { memberships, teams, users } from '../schema';
import type { TeamRole } from '$lib/workflow/permissions';
import type { RulePolicy } from '$lib/calibration/validate';

export type Team = { id: string; slug: string; name: string };
export type TeamMember = { userId: string; email: string; name: string | null; role: TeamRole; since: Date };

export async function getTeam(db: Executor, id: string): Promise<Team | null> {
	const rows = await db.select({ id: teams.id, slug: teams.slug, name: teams.name }).from(teams).where(eq(teams.id, id)).limit(1);
	return rows[0] ?? null;
}

export async function getTeamBySlug(db: Executor, slug: string): Promise<Team | null> {
	const rows = await db.select({ id: teams.id, slug: teams.slug, name: teams.name }).from(teams).where(eq(teams.slug, slug)).limit(1);
	return rows[0] ?? null;
}

export async function listTeams(db: Executor): Promise<(Team & { memberCount: number })[]> {
	const rows = await db.select({ id: teams.id, slug: teams.slug, name: teams.name }).from(teams).orderBy(asc(teams.name));
	const counts = await db.select({ teamId: memberships.teamId }).from(memberships);
	return rows.map((t) => ({ ...t, memberCount: counts.filter((c) => c.teamId === t.id).length }));
}

export async function insertTeam(db: Executor, t: { slug: string; name: string }): Promise<Team> {
	const [row] = await db.insert(teams).values(t).returning({ id: teams.id, slug: teams.slug, name: teams.name });
	if (!row) throw new Error('insert into teams returned no row');
	return row;
}

/** Members with their roles; `forUpdate` locks the team's rows inside a transaction. */
export async function listMembers(db: Executor, teamId: string, forUpdate = false): Promise<TeamMember[]> {
	const q = db
		.select({ userId: users.id, email: users.email, name: users.name, role: memberships.role, since: memberships.createdAt })
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.userId))
		.where(eq(memberships.teamId, teamId))
		.orderBy(asc(users.email));
	return forUpdate ? q.for('update', { of: memberships }) : q;
}

export async function insertMembership(db: Executor, m: { teamId: string; userId: string; role: TeamRole }): Promise<void> {
	await db.insert(memberships).values(m);
}

export async function updateMembershipRole(db: Executor, teamId: string, userId: string, role: TeamRole): Promise<void> {
	await db.update(memberships).set({ role }).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
}

export async function deleteMembership(db: Executor, teamId: string, userId: string): Promise<void> {
	await db.delete(memberships).where(and(eq(memberships.teamId, teamId), eq(memberships.userId, userId)));
}

export async function getRulePolicy(db: Executor, teamId: string): Promise<RulePolicy | null> {
	const rows = await db.select({ p: teams.rulePolicy }).from(teams).where(eq(teams.id, teamId)).limit(1);
	return rows[0]?.p ?? null;
}

export async function setRulePolicy(db: Executor, teamId: string, policy: RulePolicy): Promise<void> {
	await db.update(teams).set({ rulePolicy: policy }).where(eq(teams.id, teamId));
}

import { and, asc, eq, gt, sql } from 'drizzle-orm';
import type { Executor } from '../client';
import { memberships, sessions, teams, users } from '../schema';
import type { TeamRole } from '$lib/workflow/permissions';

export type UserRow = { id: string; email: string; name: string | null; isAdmin: boolean };

export type SessionUser = UserRow & {
	memberships: { teamId: string; teamSlug: string; teamName: string; role: TeamRole }[];
};

export const normaliseEmail = (email: string): string => email.trim().toLowerCase();

export async function findUserByEmail(db: Executor, email: string): Promise<UserRow | null> {
	const rows = await db
		.select({ id: users.id, email: users.email, name: users.name, isAdmin: users.isAdmin })
		.from(users)
		.where(eq(sql`lower(${users.email})`, normaliseEmail(email)))
		.limit(1);
	return rows[0] ?? null;
}

/** The user of an unexpired session with their team memberships, or null. */
export async function getSessionUser(db: Executor, sessionToken: string, now: Date): Promise<SessionUser | null> {
	const rows = await db
		.select({ id: users.id, email: users.email, name: users.name, isAdmin: users.isAdmin })
		.from(sessions)
		.innerJoin(users, eq(users.id, sessions.userId))
		.where(and(eq(sessions.sessionToken, sessionToken), gt(sessions.expires, now)))
		.limit(1);
	const user = rows[0];
	if (!user) return null;
	return { ...user, memberships: await listMembershipsOfUser(db, user.id) };
}

export async function listMembershipsOfUser(db: Executor, userId: string): Promise<SessionUser['memberships']> {
	return db
		.select({ teamId: teams.id, teamSlug: teams.slug, teamName: teams.name, role: memberships.role })
		.from(memberships)
		.innerJoin(teams, eq(teams.id, memberships.teamId))
		.where(eq(memberships.userId, userId))
		.orderBy(asc(teams.name));
}

/** Creates the user when the address is new; returns the user either way. */
export async function upsertUserByEmail(db: Executor, email: string, name: string | null): Promise<UserRow> {
	const existing = await findUserByEmail(db, email);
	if (existing) return existing;
	const [row] = await db
		.insert(users)
		.values({ email: normaliseEmail(email), name })
		.returning({ id: users.id, email: users.email, name: users.name, isAdmin: users.isAdmin });
	if (!row) throw new Error('insert into users returned no row');
	return row;
}

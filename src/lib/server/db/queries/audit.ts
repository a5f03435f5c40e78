import { and, desc, eq, lt } from 'drizzle-orm';
import type { Executor } from '../client';
import { auditEvents, memberships, users } from '../schema';
import type { TeamRole } from '$lib/workflow/permissions';

export type AuditInput = {
	teamId: string;
	actorId: string | null;
	action: string;
	subjectType: string;
	subjectId: string;
	details?: Record<string, unknown>;
	now?: Date;
};

export type AuditEntry = {
	id: string;
	seq: number;
	teamId: string;
	actorId: string | null;
	actorEmail: string | null;
	action: string;
	subjectType: string;
	subjectId: string;
	details: Record<string, unknown>;
	createdAt: Date;
};

export async function insertAuditEvent(db: Executor, a: AuditInput): Promise<{ id: string; seq: number }> {
	const [row] = await db
		.insert(auditEvents)
		.values({
			teamId: a.teamId,
			actorId: a.actorId,
			action: a.action,
			subjectType: a.subjectType,
			subjectId: a.subjectId,
			details: a.details ?? {},
			...(a.now ? { createdAt: a.now } : {})
		})
		.returning({ id: auditEvents.id, seq: auditEvents.seq });
	if (!row) throw new Error('insert into audit_events returned no row');
	return row;
}

/** A team's audit entries, newest first, before `beforeSeq` when given. */
export async function listAuditEvents(db: Executor, teamId: string, q: { beforeSeq: number | null; limit: number }): Promise<AuditEntry[]> {
	return db
		.select({
			id: auditEvents.id,
			seq: auditEvents.seq,
			teamId: auditEvents.teamId,
			actorId: auditEvents.actorId,
			actorEmail: users.email,
			action: auditEvents.action,
			subjectType: auditEvents.subjectType,
			subjectId: auditEvents.subjectId,
			details: auditEvents.details,
			createdAt: auditEvents.createdAt
		})
		.from(auditEvents)
		.leftJoin(users, eq(users.id, auditEvents.actorId))
		.where(and(eq(auditEvents.teamId, teamId), q.beforeSeq === null ? undefined : lt(auditEvents.seq, q.beforeSeq)))
		.orderBy(desc(auditEvents.seq))
		.limit(q.limit);
}

export type ActingUser = { id: string; email: string; name: string | null; isAdmin: boolean; memberships: { teamId: string; role: TeamRole }[] };

/** A user with their team roles, as the permission checks need them. */
export async function getActingUser(db: Executor, userId: string): Promise<ActingUser | null> {
	const rows = await db.select({ id: users.id, email: users.email, name: users.name, isAdmin: users.isAdmin }).from(users).where(eq(users.id, userId)).limit(1);
	const u = rows[0];
	if (!u) return null;
	const ms = await db.select({ teamId: memberships.teamId, role: memberships.role }).from(memberships).where(eq(memberships.userId, userId));
	return { ...u, memberships: ms };
}

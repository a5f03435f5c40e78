import { z } from 'zod';
import type { Executor } from '../db/client';
import { getActingUser, insertAuditEvent, listAuditEvents, type ActingUser, type AuditEntry, type AuditInput } from '../db/queries/audit';
import type { Actor } from '$lib/workflow/permissions';
import { fail, type DomainResult } from '$lib/workflow/errors';

/** Writes one audit entry; call it inside the transaction of the action it records. */
export async function recordAudit(tx: Executor, input: AuditInput): Promise<void> {
	await insertAuditEvent(tx, input);
}

const auditPageSchema = z.object({
	cursor: z
		.string()
		.regex(/^[1-9][0-9]{0,15}$/, { message: 'The cursor is not one this list handed out; start again from the first page.' })
		.nullish(),
	limit: z.number().int().min(1, { message: 'Ask for at least 1 entry.' }).max(200, { message: 'Ask for at most 200 entries a page.' }).default(50)
});

/** A team's audit log, newest first, one page at a time (`nextCursor` is null on the last page). */
export async function listAudit(db: Executor, teamId: string, page: { cursor?: string | null; limit?: number } = {}): Promise<DomainResult<{ items: AuditEntry[]; nextCursor: string | null }>> {
	const parsed = auditPageSchema.safeParse(page);
	if (!parsed.success) {
		return fail('validation_failed', 'The audit page request is not valid.', parsed.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })));
	}
	const { cursor, limit } = parsed.data;
	const rows = await listAuditEvents(db, teamId, { beforeSeq: cursor ? Number(cursor) : null, limit: limit + 1 });
	const items = rows.slice(0, limit);
	const last = items[items.length - 1];
	return { ok: true, value: { items, nextCursor: rows.length > limit && last ? String(last.seq) : null } };
}

/** The acting user with their current roles, read in the caller's transaction. */
export async function loadActor(db: Executor, userId: string): Promise<{ actor: Actor; user: ActingUser } | null> {
	const user = await getActingUser(db, userId);
	if (!user) return null;
	return { actor: { userId: user.id, isAdmin: user.isAdmin, memberships: user.memberships }, user };
}

/** How a person is named in messages and timelines. */
export function displayNameOf(user: { name: string | null; email: string }): string {
	return user.name && user.name.trim() !== '' ? user.name : user.email;
}

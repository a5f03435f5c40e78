import { and, asc, desc, eq, inArray, lte } from 'drizzle-orm';
import type { Executor } from '../client';
import { notifications, notificationSettings, users, type NotificationPayload } from '../schema';

export const NOTIFICATION_KINDS = ['review_requested', 'review_decided', 'comment_added', 'recipe_forked'] as const;
export type NotificationKind = (typeof NOTIFICATION_KINDS)[number];

/** The recipients among `userIds` who have not turned `kind` off. */
export async function filterEnabledRecipients(db: Executor, kind: NotificationKind, userIds: readonly string[]): Promise<string[]> {
	if (userIds.length === 0) return [];
	const off = await db
		.select({ userId: notificationSettings.userId })
		.from(notificationSettings)
		.where(and(eq(notificationSettings.kind, kind), eq(notificationSettings.enabled, false), inArray(notificationSettings.userId, [...userIds])));
	const disabled = new Set(off.map((r) => r.userId));
	return userIds.filter((id) => !disabled.has(id));
}

export async function insertNotifications(
	db: Executor,
	rows: readonly { kind: NotificationKind; recipientId: string; linkPath: string; payload: NotificationPayload; now: Date }[]
): Promise<number> {
	if (rows.length === 0) return 0;
	const inserted = await db
		.insert(notifications)
		.values(rows.map((r) => ({ kind: r.kind, recipientId: r.recipientId, linkPath: r.linkPath, payload: r.payload, createdAt: r.now, nextAttemptAt: r.now })))
		.returning({ id: notifications.id });
	return inserted.length;
}

export async function listNotificationSettings(db: Executor, userId: string): Promise<{ kind: NotificationKind; enabled: boolean }[]> {
	return db.select({ kind: notificationSettings.kind, enabled: notificationSettings.enabled }).from(notificationSettings).where(eq(notificationSettings.userId, userId));
}

export async function upsertNotificationSetting(db: Executor, s: { userId: string; kind: NotificationKind; enabled: boolean; now: Date }): Promise<void> {
	await db
		.insert(notificationSettings)
		.values({ userId: s.userId, kind: s.kind, enabled: s.enabled, updatedAt: s.now })
		.onConflictDoUpdate({ target: [notificationSettings.userId, notificationSettings.kind], set: { enabled: s.enabled, updatedAt: s.now } });
}

export type DueNotification = {
	id: string;
	kind: NotificationKind;
	recipientEmail: string;
	linkPath: string;
	payload: NotificationPayload;
	attempts: number;
};

/**
 * Locks up to `limit` pending rows that are due, skipping rows another worker holds, so
 * several workers never send the same message at once. Call inside a transaction.
 */
export async function claimDueNotifications(db: Executor, now: Date, limit: number): Promise<DueNotification[]> {
	return db
		.select({
			id: notifications.id,
			kind: notifications.kind,
			recipientEmail: users.email,
			linkPath: notifications.linkPath,
			payload: notifications.payload,
			attempts: notifications.attempts
		})
		.from(notifications)
		.innerJoin(users, eq(users.id, notifications.recipientId))
		.where(and(eq(notifications.status, 'pending'), lte(notifications.nextAttemptAt, now)))
		.orderBy(asc(notifications.nextAttemptAt), asc(notifications.id))
		.limit(limit)
		.for('update', { of: notifications, skipLocked: true });
}

export async function markNotificationSent(db: Executor, id: string, now: Date): Promise<void> {
	await db.update(notifications).set({ status: 'sent', sentAt: now, lastError: null }).where(eq(notifications.id, id));
}

export async function markNotificationAttemptFailed(
	db: Executor,
	id: string,
	f: { attempts: number; error: string; nextAttemptAt: Date; giveUp: boolean }
): Promise<void> {
	await db
		.update(notifications)
		.set({ attempts: f.attempts, lastError: f.error, nextAttemptAt: f.nextAttemptAt, status: f.giveUp ? 'failed' : 'pending' })
		.where(eq(notifications.id, id));
}

export type FailedNotification = {
	id: string;
	kind: NotificationKind;
	recipientEmail: string;
	linkPath: string;
	attempts: number;
	lastError: string | null;
	createdAt: Date;
	lastAttemptAt: Date;
};

/** Messages the worker gave up on, newest first (for the admin page). */
export async function listFailedNotificationRows(db: Executor, limit: number): Promise<FailedNotification[]> {
	return db
		.select({
			id: notifications.id,
			kind: notifications.kind,
			recipientEmail: users.email,
			linkPath: notifications.linkPath,
			attempts: notifications.attempts,
			lastError: notifications.lastError,
			createdAt: notifications.createdAt,
			lastAttemptAt: notifications.nextAttemptAt
		})
		.from(notifications)
		.innerJoin(users, eq(users.id, notifications.recipientId))
		.where(eq(notifications.status, 'failed'))
		.orderBy(desc(notifications.nextAttemptAt), desc(notifications.id))
		.limit(limit);
}

/** Puts a failed message back in the queue, due at `now`, with a fresh count of attempts. */
export async function requeueFailedNotification(db: Executor, id: string, now: Date): Promise<boolean> {
	const rows = await db
		.update(notifications)
		.set({ status: 'pending', attempts: 0, nextAttemptAt: now })
		.where(and(eq(notifications.id, id), eq(notifications.status, 'failed')))
		.returning({ id: notifications.id });
	return rows.length > 0;
}

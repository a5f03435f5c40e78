import { z } from 'zod';
import type { Executor } from '../db/client';
import type { NotificationPayload } from '../db/schema';
import {
	filterEnabledRecipients,
	insertNotifications,
	listFailedNotificationRows,
	listNotificationSettings,
	NOTIFICATION_KINDS,
	requeueFailedNotification,
	upsertNotificationSetting,
	type FailedNotification,
	type NotificationKind
} from '../db/queries/notifications';
import { fail, type DomainResult } from '$lib/workflow/errors';
import { inResultTransaction } from '../db/transaction';

export { NOTIFICATION_KINDS, type NotificationKind };

/**
 * Queues one message of `kind` per recipient (duplicates and `excludeIds` dropped, people who
 * turned the kind off skipped). Call inside the action's transaction; nothing is sent here.
 */
export async function queueNotifications(
	tx: Executor,
	n: { kind: NotificationKind; recipientIds: readonly (string | null)[]; excludeIds: readonly (string | null)[]; linkPath: string; payload: NotificationPayload; now: Date }
): Promise<number> {
	const excluded = new Set(n.excludeIds.filter((id): id is string => id !== null));
	const candidates = [...new Set(n.recipientIds.filter((id): id is string => id !== null && !excluded.has(id)))];
	const recipients = await filterEnabledRecipients(tx, n.kind, candidates);
	return insertNotifications(
		tx,
		recipients.map((recipientId) => ({ kind: n.kind, recipientId, linkPath: n.linkPath, payload: n.payload, now: n.now }))
	);
}

export type NotificationSettings = Record<NotificationKind, boolean>;

/** A person's setting for every kind (on unless turned off). */
export async function getNotificationSettings(db: Executor, userId: string): Promise<NotificationSettings> {
	const settings: NotificationSettings = { review_requested: true, review_decided: true, comment_added: true, recipe_forked: true };
	for (const s of await listNotificationSettings(db, userId)) settings[s.kind] = s.enabled;
	return settings;
}

const settingSchema = z.object({
	kind: z.enum(NOTIFICATION_KINDS, { message: `Choose one of the notification kinds: ${NOTIFICATION_KINDS.join(', ')}.` }),
	enabled: z.boolean({ message: 'Say whether this kind of e-mail is on (true) or off (false).' })
});

/** Turns one kind of e-mail on or off for a person. */
export async function setNotificationSetting(
	db: Executor,
	input: { userId: string; kind: unknown; enabled: unknown; now?: Date }
): Promise<DomainResult<NotificationSettings>> {
	const parsed = settingSchema.safeParse({ kind: input.kind, enabled: input.enabled });
	if (!parsed.success) {
		return fail('validation_failed', 'The notification setting is not valid.', parsed.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })));
	}
	return inResultTransaction(db, async (tx) => {
		await upsertNotificationSetting(tx, { userId: input.userId, kind: parsed.data.kind, enabled: parsed.data.enabled, now: input.now ?? new Date() });
		return { ok: true, value: await getNotificationSettings(tx, input.userId) };
	});
}

/** Messages the worker gave up on (admin page), newest first. */
export async function listFailedNotifications(db: Executor, opts: { limit?: number } = {}): Promise<FailedNotification[]> {
	return listFailedNotificationRows(db, Math.min(Math.max(opts.limit ?? 100, 1), 500));
}

/** Puts a failed message back in the queue (admin action). */
export async function retryFailedNotification(db: Executor, input: { id: string; now?: Date }): Promise<DomainResult<{ id: string }>> {
	const requeued = await requeueFailedNotification(db, input.id, input.now ?? new Date());
	if (!requeued) return fail('not_found', 'No failed message with this id; it may have been retried already.');
	return { ok: true, value: { id: input.id } };
}

import { boolean, index, integer, jsonb, pgEnum, pgTable, primaryKey, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { users } from './users';

export const notificationKind = pgEnum('notification_kind', ['review_requested', 'review_decided', 'comment_added', 'recipe_forked']);
export const notificationStatus = pgEnum('notification_status', ['pending', 'sent', 'failed']);

/** What a message needs besides its recipient; user text is kept as typed and escaped when the HTML part is built. */
export type NotificationPayload = {
	recipeTitle: string;
	version: number;
	teamName: string;
	actorName: string;
	decision?: 'approved' | 'changes_requested';
	note?: string;
	commentExcerpt?: string;
	programLine?: number | null;
	forkTeamName?: string;
};

// The outbox: a row per message, written in the transaction of the action that caused it
// and sent later by the worker (mail/worker.ts), so a mail problem never fails the action.
export const notifications = pgTable(
	'notifications',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		kind: notificationKind('kind').notNull(),
		recipientId: uuid('recipient_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		// Path of the page the message links to, e.g. /recipes/<id>/versions/3/reviews.
		linkPath: text('link_path').notNull(),
		payload: jsonb('payload').$type<NotificationPayload>().notNull(),
		status: notificationStatus('status').notNull().default('pending'),
		attempts: integer('attempts').notNull().default(0),
		nextAttemptAt: timestamp('next_attempt_at', { withTimezone: true }).notNull().defaultNow(),
		lastError: text('last_error'),
		sentAt: timestamp('sent_at', { withTimezone: true }),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [index('notifications_due_idx').on(t.status, t.nextAttemptAt), index('notifications_recipient_idx').on(t.recipientId, t.createdAt)]
);

// A person's choice per kind; no row means the kind is on.
export const notificationSettings = pgTable(
	'notification_settings',
	{
		userId: uuid('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		kind: notificationKind('kind').notNull(),
		enabled: boolean('enabled').notNull(),
		updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [primaryKey({ columns: [t.userId, t.kind] })]
);

import { check, index, integer, pgEnum, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import { recipeVersions } from './recipes';
import { users } from './users';

export const reviewState = pgEnum('review_state', ['draft', 'in_review', 'approved', 'changes_requested']);
export const reviewAction = pgEnum('review_action', ['submit', 'approve', 'request_changes', 'withdraw']);

/** Longest comment body accepted (characters). */
export const MAX_COMMENT_CHARS = 5000;

// The current review state of a saved version. Kept apart from recipe_versions because
// those rows are immutable (a trigger refuses UPDATE); a version without a row is `draft`.
export const versionReviewStates = pgTable('version_review_states', {
	recipeVersionId: uuid('recipe_version_id')
		.primaryKey()
		.references(() => recipeVersions.id, { onDelete: 'cascade' }),
	state: reviewState('state').notNull().default('draft'),
	updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow()
});

// Every review state change: who moved which version from what to what, and when.
export const reviewEvents = pgTable(
	'review_events',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		recipeVersionId: uuid('recipe_version_id')
			.notNull()
			.references(() => recipeVersions.id, { onDelete: 'cascade' }),
		action: reviewAction('action').notNull(),
		fromState: reviewState('from_state').notNull(),
		toState: reviewState('to_state').notNull(),
		actorId: uuid('actor_id').references(() => users.id, { onDelete: 'set null' }),
		note: text('note'),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [index('review_events_version_idx').on(t.recipeVersionId, t.createdAt)]
);

// Review comments on a whole version, or anchored to one line of its rendered program.
export const reviewComments = pgTable(
	'review_comments',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		recipeVersionId: uuid('recipe_version_id')
			.notNull()
			.references(() => recipeVersions.id, { onDelete: 'cascade' }),
		authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
		body: text('body').notNull(),
		programLine: integer('program_line'),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [
		index('review_comments_version_idx').on(t.recipeVersionId, t.createdAt),
		check('review_comments_body_length', sql`char_length(${t.body}) between 1 and ${sql.raw(String(MAX_COMMENT_CHARS))}`),
		check('review_comments_line_positive', sql`${t.programLine} is null or ${t.programLine} >= 1`)
	]
);

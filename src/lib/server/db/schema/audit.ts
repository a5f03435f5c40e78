import { bigint, index, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { teams } from './teams';
import { users } from './users';

// The team's audit log: version, review, sharing, fork and template actions. Rows are only
// ever inserted. `seq` orders them (several rows of one transaction share created_at) and
// is the cursor of the paginated list.
export const auditEvents = pgTable(
	'audit_events',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		seq: bigint('seq', { mode: 'number' }).generatedAlwaysAsIdentity().notNull().unique(),
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		actorId: uuid('actor_id').references(() => users.id, { onDelete: 'set null' }),
		action: text('action').notNull(),
		subjectType: text('subject_type').notNull(),
		subjectId: text('subject_id').notNull(),
		details: jsonb('details').$type<Record<string, unknown>>().notNull().default({}),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [index('audit_events_team_idx').on(t.teamId, t.seq)]
);

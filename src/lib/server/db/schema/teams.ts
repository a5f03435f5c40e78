import { jsonb, pgEnum, pgTable, primaryKey, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { users } from './users';
import type { RulePolicy } from '$lib/calibration/validate';

export const teamRole = pgEnum('team_role', ['member', 'reviewer', 'lead']);

export const teams = pgTable('teams', {
	id: uuid('id').primaryKey().defaultRandom(),
	slug: text('slug').notNull().unique(),
	name: text('name').notNull(),
	// The lead's relaxations or tightenings of named validation rules (validate()'s policy).
	rulePolicy: jsonb('rule_policy').$type<RulePolicy>().notNull().default({ overrides: {} }),
	createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
});

export const memberships = pgTable(
	'memberships',
	{
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		userId: uuid('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		role: teamRole('role').notNull(),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [primaryKey({ columns: [t.teamId, t.userId] })]
);

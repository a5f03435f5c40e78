import { integer, jsonb, pgTable, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core';
import { teams } from './teams';
import { users } from './users';

// A script template set (the starter set has no team) and its immutable versions.
export const scriptTemplates = pgTable(
	'script_templates',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		name: text('name').notNull(),
		teamId: uuid('team_id').references(() => teams.id, { onDelete: 'cascade' }),
		description: text('description').notNull().default(''),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [unique('script_templates_name_team').on(t.name, t.teamId).nullsNotDistinct()]
);

export const templateVersions = pgTable(
	'template_versions',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		templateId: uuid('template_id')
			.notNull()
			.references(() => scriptTemplates.id, { onDelete: 'cascade' }),
		version: integer('version').notNull(),
		files: jsonb('files').$type<Record<string, string>>().notNull(),
		sha256: text('sha256').notNull(),
		changelog: text('changelog').notNull(),
		authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [unique('template_versions_template_version').on(t.templateId, t.version)]
);

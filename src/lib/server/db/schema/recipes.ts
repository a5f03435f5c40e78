import { index, integer, jsonb, pgTable, text, timestamp, unique, uuid, type AnyPgColumn } from 'drizzle-orm/pg-core';
import { teams } from './teams';
import { users } from './users';
import { observations } from './observations';
import { templateVersions } from './templates';
import type { RecipeParams } from '$lib/calibration/recipe';
import type { Finding } from '$lib/calibration/validate';

// A recipe (one team's plan for one observation setup) with its working draft, and its
// immutable saved versions. `draftRevision` guards against silent overwrites.
export const recipes = pgTable(
	'recipes',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		title: text('title').notNull(),
		observationId: uuid('observation_id').references(() => observations.id, { onDelete: 'set null' }),
		draft: jsonb('draft').$type<RecipeParams>().notNull(),
		draftRevision: integer('draft_revision').notNull().default(1),
		createdBy: uuid('created_by').references(() => users.id, { onDelete: 'set null' }),
		updatedBy: uuid('updated_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
		updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
		// Fork lineage (DESIGN.md "Fork"): the recipe and version this one was copied from.
		forkedFromRecipeId: uuid('forked_from_recipe_id').references((): AnyPgColumn => recipes.id, { onDelete: 'set null' }),
		forkedFromVersion: integer('forked_from_version')
	},
	(t) => [index('recipes_team_idx').on(t.teamId, t.updatedAt), index('recipes_forked_from_idx').on(t.forkedFromRecipeId)]
);

export const recipeVersions = pgTable(
	'recipe_versions',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		recipeId: uuid('recipe_id')
			.notNull()
			.references(() => recipes.id, { onDelete: 'cascade' }),
		version: integer('version').notNull(),
		params: jsonb('params').$type<RecipeParams>().notNull(),
		paramsSha256: text('params_sha256').notNull(),
		templateVersionId: uuid('template_version_id')
			.notNull()
			.references(() => templateVersions.id),
		program: text('program').notNull(),
		programSha256: text('program_sha256').notNull(),
		findings: jsonb('findings').$type<Finding[]>().notNull(),
		message: text('message').notNull(),
		authorId: uuid('author_id').references(() => users.id, { onDelete: 'set null' }),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [unique('recipe_versions_recipe_version').on(t.recipeId, t.version)]
);

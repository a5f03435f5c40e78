import { doublePrecision, index, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import { recipes } from './recipes';
import { users } from './users';

// A recipe a lead has shared with all teams (one row while shared; withdrawing deletes it,
// the audit log keeps the history). The observation's array name and frequency coverage are
// copied here when sharing, so the Shared page can filter on plain indexed columns.
export const recipeShares = pgTable(
	'recipe_shares',
	{
		recipeId: uuid('recipe_id')
			.primaryKey()
			.references(() => recipes.id, { onDelete: 'cascade' }),
		sharedBy: uuid('shared_by').references(() => users.id, { onDelete: 'set null' }),
		arrayName: text('array_name'),
		minFreqHz: doublePrecision('min_freq_hz'),
		maxFreqHz: doublePrecision('max_freq_hz'),
		sharedAt: timestamp('shared_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [index('recipe_shares_shared_at_idx').on(t.sharedAt, t.recipeId)]
);

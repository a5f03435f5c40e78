import { customType, index, integer, jsonb, pgTable, text, timestamp, unique, uuid } from 'drizzle-orm/pg-core';
import { teams } from './teams';
import { users } from './users';
import type { ObservationSummary } from '$lib/calibration/observation';

const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => 'bytea' });

// An uploaded observation summary: the exact bytes received, their SHA-256, and the
// parsed summary. Scoped to one team.
export const observations = pgTable(
	'observations',
	{
		id: uuid('id').primaryKey().defaultRandom(),
		teamId: uuid('team_id')
			.notNull()
			.references(() => teams.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		originalBytes: bytea('original_bytes').notNull(),
		originalFilename: text('original_filename').notNull(),
		sizeBytes: integer('size_bytes').notNull(),
		sha256: text('sha256').notNull(),
		summary: jsonb('summary').$type<ObservationSummary>().notNull(),
		uploadedBy: uuid('uploaded_by').references(() => users.id, { onDelete: 'set null' }),
		createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow()
	},
	(t) => [unique('observations_team_sha256').on(t.teamId, t.sha256), index('observations_team_idx').on(t.teamId, t.createdAt)]
);

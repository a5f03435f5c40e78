import { migrate } from 'drizzle-orm/node-postgres/migrator';
import type { Database } from './client';

/** Applies the committed SQL migrations in `drizzle/` (idempotent). */
export async function runMigrations(db: Database, migrationsFolder = 'drizzle'): Promise<void> {
	await migrate(db, { migrationsFolder });
}

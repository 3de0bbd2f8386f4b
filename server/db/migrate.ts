/** Applies the generated SQL migrations in drizzle/ (drizzle-orm's node-postgres migrator). */
import { fileURLToPath } from 'node:url';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import type { Database } from './client.js';

export const MIGRATIONS_FOLDER = fileURLToPath(new URL('../../drizzle', import.meta.url));

export async function migrateDatabase(db: Database): Promise<void> {
  await migrate(db.orm, { migrationsFolder: MIGRATIONS_FOLDER });
}

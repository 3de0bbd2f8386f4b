/**
 * Applies the generated SQL migrations in drizzle/ (drizzle-orm's
 * node-postgres migrator), under an advisory lock so several servers
 * starting together migrate once; then pg-boss's own migrations (the job
 * queue's `pgboss` schema, server/compute/queue.ts). Run directly
 * (`node --import tsx server/db/migrate.ts`) it migrates $DATABASE_URL.
 */
import { fileURLToPath, pathToFileURL } from 'node:url';
import { drizzle } from 'drizzle-orm/node-postgres';
import { migrate } from 'drizzle-orm/node-postgres/migrator';
import { createDatabase, type Database } from './client.js';
import { loadConfig } from '../config.js';
import { installQueue } from '../compute/queue.js';

export const MIGRATIONS_FOLDER = fileURLToPath(new URL('../../drizzle', import.meta.url));
const MIGRATION_LOCK = 742000;

export async function migrateDatabase(db: Database): Promise<void> {
  const client = await db.pool.connect();
  try {
    await client.query('SELECT pg_advisory_lock($1)', [MIGRATION_LOCK]);
    try {
      await migrate(drizzle(client), { migrationsFolder: MIGRATIONS_FOLDER });
      // The job queue's tables, by pg-boss's own migrations, in its own schema.
      await installQueue(client);
    } finally {
      await client.query('SELECT pg_advisory_unlock($1)', [MIGRATION_LOCK]);
    }
  } finally {
    client.release();
  }
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const db = createDatabase(loadConfig(process.env).databaseUrl);
  migrateDatabase(db)
    .then(() => console.log('Migrations applied.'))
    .catch((err: unknown) => {
      console.error('Migration failed:', err instanceof Error ? err.message : err);
      process.exitCode = 1;
    })
    .finally(() => db.close());
}

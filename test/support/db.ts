/** Databases for test files, in the run's throwaway cluster. */
import { inject } from 'vitest';
import { randomBytes } from 'node:crypto';
import { createDatabase } from '../../server/tools/pg.js';

/** An empty database (no tables): for tests of migrating itself. */
export function freshDatabaseUrl(prefix = 't'): string {
  return createDatabase(inject('pgPort'), `${prefix}_${randomBytes(6).toString('hex')}`);
}

/**
 * A database with every migration applied, copied from the run's template
 * (test/support/pg-global-setup.ts): what `startTestApp()` and the e2e server
 * start on. Starting an app on it still runs `migrateDatabase()`, which finds
 * nothing pending.
 */
export function migratedDatabaseUrl(prefix = 't'): string {
  return createDatabase(inject('pgPort'), `${prefix}_${randomBytes(6).toString('hex')}`, inject('pgTemplate'));
}

/**
 * A migrated database with the demo seeded (`seedDemo` at bcrypt cost 4), copied from the run's
 * seeded template: what `startTestApp({ seed: true })` starts on. Seeding it again finds
 * everything there (the seed is idempotent).
 */
export function seededDatabaseUrl(prefix = 't'): string {
  return createDatabase(inject('pgPort'), `${prefix}_${randomBytes(6).toString('hex')}`, inject('pgSeededTemplate'));
}

/**
 * A migrated database with the whole demo (`seedDemo` at bcrypt cost 4 and the demo programme),
 * copied from the browser tests' template (test/support/e2e-global-setup.ts): what each e2e file's
 * server starts on. Only the `e2e` project provides that template.
 */
export function demoDatabaseUrl(prefix = 't'): string {
  return createDatabase(inject('pgPort'), `${prefix}_${randomBytes(6).toString('hex')}`, inject('pgDemoTemplate'));
}

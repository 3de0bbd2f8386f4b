/**
 * The browser tests' run set-up (vitest project `e2e`), done once per run instead of once per file:
 * a database template with the whole demo scenario (`seedDemo` at bcrypt cost 4, then
 * `seedDemoProgramme`), which each file's server starts on a copy of (`demoDatabaseUrl()`); the
 * server still runs the migrations and both seeds on start and finds nothing to do. (Each file
 * starts its own Chromium: test/support/e2e.ts.)
 * The cluster is npm test's (ROLLWISE_TEST_PG_PORT) or a throwaway one (test/support/pg-global-setup.ts).
 */
import type { TestProject } from 'vitest/node';
import { migrateDatabase } from '../../server/db/migrate.js';
import { seedDemo } from '../../server/db/seed.js';
import { seedDemoProgramme } from '../../server/db/seed-programme.js';
import { SEED_BCRYPT_ROUNDS, template, withRunCluster } from './pg-global-setup.js';

export default async function setup(project: TestProject) {
  const run = await withRunCluster(async (port) => {
    const migrated = await template(port, 'migrated', migrateDatabase);
    const demo = await template(
      port,
      'demo',
      async (db) => {
        await seedDemo(db.orm, { bcryptRounds: SEED_BCRYPT_ROUNDS });
        await seedDemoProgramme(db.orm);
      },
      migrated,
    );
    return { migrated, demo };
  });
  project.provide('pgPort', run.port);
  project.provide('pgTemplate', run.made.migrated);
  project.provide('pgDemoTemplate', run.made.demo);
  return run.teardown;
}

declare module 'vitest' {
  export interface ProvidedContext {
    /** The migrated database with the demo and the demo programme seeded (bcrypt cost 4), copied by `demoDatabaseUrl()`. */
    pgDemoTemplate: string;
  }
}

/**
 * One throwaway PostgreSQL cluster per vitest run. Each test file creates its
 * own database in it (see test/support/db.ts), so files stay independent.
 * When ROLLWISE_TEST_PG_PORT is set (npm test starts one cluster for every
 * runner) that cluster is reused instead.
 *
 * Migrating a database costs about a second of CPU (ours, then pg-boss's);
 * a copy of a migrated database (`CREATE DATABASE … TEMPLATE`) costs a file
 * copy. So the migrations run once here, into a template database that
 * `migratedDatabaseUrl()` copies for each file.
 */
import { randomBytes } from 'node:crypto';
import type { TestProject } from 'vitest/node';
import { createDatabase as createPgDatabase, dropDatabase, startThrowawayCluster } from '../../server/tools/pg.js';
import { createDatabase } from '../../server/db/client.js';
import { migrateDatabase } from '../../server/db/migrate.js';

async function migratedTemplate(port: number): Promise<string> {
  const name = `template_${randomBytes(6).toString('hex')}`;
  const db = createDatabase(createPgDatabase(port, name));
  try {
    await migrateDatabase(db);
  } finally {
    // A template must have no connections left when it is copied.
    await db.close();
  }
  return name;
}

export default async function setup(project: TestProject) {
  const shared = process.env['ROLLWISE_TEST_PG_PORT'];
  if (shared) {
    const port = Number(shared);
    const template = await migratedTemplate(port);
    project.provide('pgPort', port);
    project.provide('pgTemplate', template);
    return () => dropDatabase(port, template);
  }
  const cluster = await startThrowawayCluster('postgres_probe');
  project.provide('pgPort', cluster.port);
  project.provide('pgTemplate', await migratedTemplate(cluster.port));
  return () => cluster.remove();
}

declare module 'vitest' {
  export interface ProvidedContext {
    pgPort: number;
    /** A database with every migration applied, copied by `migratedDatabaseUrl()`. */
    pgTemplate: string;
  }
}

/**
 * One throwaway PostgreSQL cluster per vitest run. Each test file creates its
 * own database in it (see test/support/db.ts), so files stay independent.
 * When ROLLWISE_TEST_PG_PORT is set (npm test starts one cluster for every
 * runner) that cluster is reused instead.
 *
 * Migrating a database costs about a second of CPU (ours, then pg-boss's);
 * a copy of a migrated database (`CREATE DATABASE … TEMPLATE`) costs a file
 * copy. So the migrations run once here, into a template database that
 * `migratedDatabaseUrl()` copies for each file; and the demo seed (which
 * walks the demo configurations through review, computing their results)
 * runs once, into a second template that `seededDatabaseUrl()` copies.
 */
import { randomBytes } from 'node:crypto';
import type { TestProject } from 'vitest/node';
import { createDatabase as createPgDatabase, dropDatabase, startThrowawayCluster } from '../../server/tools/pg.js';
import { createDatabase } from '../../server/db/client.js';
import { migrateDatabase } from '../../server/db/migrate.js';
import { seedDemo } from '../../server/db/seed.js';

/** The bcrypt cost of the seeded template's demo passwords: what `startTestApp({ seed: true })` always used. */
export const SEED_BCRYPT_ROUNDS = 4;

interface Templates {
  migrated: string;
  seeded: string;
}

/** Fills a new database (empty, or a copy of `from`); closes every connection after, as a template needs. */
export async function template(port: number, kind: string, fill: (db: ReturnType<typeof createDatabase>) => Promise<void>, from?: string): Promise<string> {
  const name = `template_${kind}_${randomBytes(6).toString('hex')}`;
  const db = createDatabase(createPgDatabase(port, name, from));
  try {
    await fill(db);
  } finally {
    await db.close();
  }
  return name;
}

async function templates(port: number): Promise<Templates> {
  const migrated = await template(port, 'migrated', migrateDatabase);
  const seeded = await template(port, 'seeded', (db) => seedDemo(db.orm, { bcryptRounds: SEED_BCRYPT_ROUNDS }), migrated);
  return { migrated, seeded };
}

function provide(project: TestProject, port: number, t: Templates): void {
  project.provide('pgPort', port);
  project.provide('pgTemplate', t.migrated);
  project.provide('pgSeededTemplate', t.seeded);
}

/**
 * The run's cluster: npm test's (ROLLWISE_TEST_PG_PORT) when set, else a throwaway one; `templates`
 * fills it. The teardown drops the templates from a shared cluster, or removes a throwaway one.
 */
export async function withRunCluster<T extends { [K in keyof T]: string }>(templates: (port: number) => Promise<T>): Promise<{ port: number; made: T; teardown(): void }> {
  const shared = process.env['ROLLWISE_TEST_PG_PORT'];
  if (shared) {
    const port = Number(shared);
    const made = await templates(port);
    return { port, made, teardown: () => Object.values<string>(made).forEach((name) => dropDatabase(port, name)) };
  }
  const cluster = await startThrowawayCluster('postgres_probe');
  return { port: cluster.port, made: await templates(cluster.port), teardown: () => cluster.remove() };
}

export default async function setup(project: TestProject) {
  const run = await withRunCluster(templates);
  provide(project, run.port, run.made);
  return run.teardown;
}

declare module 'vitest' {
  export interface ProvidedContext {
    pgPort: number;
    /** A database with every migration applied, copied by `migratedDatabaseUrl()`. */
    pgTemplate: string;
    /** That database with the demo seeded (`seedDemo`, bcrypt cost 4), copied by `seededDatabaseUrl()`. */
    pgSeededTemplate: string;
  }
}

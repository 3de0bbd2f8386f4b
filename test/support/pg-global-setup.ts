/**
 * One throwaway PostgreSQL cluster per vitest run. Each test file creates its
 * own database in it (see test/support/db.ts), so files stay independent.
 * When ROLLWISE_TEST_PG_PORT is set (npm test starts one cluster for every
 * runner) that cluster is reused instead.
 */
import type { TestProject } from 'vitest/node';
import { startThrowawayCluster } from '../../server/tools/pg.js';

export default async function setup(project: TestProject) {
  if (process.env['ROLLWISE_TEST_PG_PORT']) {
    project.provide('pgPort', Number(process.env['ROLLWISE_TEST_PG_PORT']));
    return;
  }
  const cluster = await startThrowawayCluster('postgres_probe');
  project.provide('pgPort', cluster.port);
  return () => cluster.remove();
}

declare module 'vitest' {
  export interface ProvidedContext {
    pgPort: number;
  }
}

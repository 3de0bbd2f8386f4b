/**
 * The browser tests' run set-up (vitest project `e2e`), done once per run instead of once per file:
 *   - a database template with the whole demo scenario (`seedDemo` at bcrypt cost 4, then
 *     `seedDemoProgramme`), which each file's server starts on a copy of (`demoDatabaseUrl()`);
 *     the server still runs the migrations and both seeds on start and finds nothing to do;
 *   - one Chromium (Debian's), started as a browser server; each file connects to it and opens
 *     its pages in contexts of its own (own cookies and storage), closed when the file ends.
 * The cluster is npm test's (ROLLWISE_TEST_PG_PORT) or a throwaway one (test/support/pg-global-setup.ts).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { tmpdir } from 'node:os';
import { chromium } from 'playwright-core';
import type { TestProject } from 'vitest/node';
import { defaultChromiumPath } from '../../server/config.js';
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
  const home = mkdtempSync(join(tmpdir(), 'rollwise-chromium-'));
  let browser: Awaited<ReturnType<typeof chromium.launchServer>> | undefined;
  const teardown = async () => {
    await browser?.close();
    rmSync(home, { recursive: true, force: true });
    run.teardown();
  };
  try {
    browser = await chromium.launchServer({
      executablePath: process.env['CHROMIUM_PATH'] || defaultChromiumPath(),
      headless: true,
      args: ['--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'],
      env: { ...process.env, HOME: home, XDG_CONFIG_HOME: join(home, 'config'), XDG_CACHE_HOME: join(home, 'cache') },
    });
  } catch (err) {
    await teardown();
    throw err;
  }
  project.provide('pgPort', run.port);
  project.provide('pgTemplate', run.made.migrated);
  project.provide('pgDemoTemplate', run.made.demo);
  project.provide('chromiumWsEndpoint', browser.wsEndpoint());
  return teardown;
}

declare module 'vitest' {
  export interface ProvidedContext {
    /** The migrated database with the demo and the demo programme seeded (bcrypt cost 4), copied by `demoDatabaseUrl()`. */
    pgDemoTemplate: string;
    /** The run's Chromium, for `chromium.connect()` (test/support/e2e.ts). */
    chromiumWsEndpoint: string;
  }
}

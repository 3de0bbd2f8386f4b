import { defineConfig } from 'vitest/config';
import { SlowFirstSequencer } from './test/support/slow-first-sequencer';

// Suites outside src/: the engineering core (shared), the API against a real
// PostgreSQL (server) and the browser tests in Chromium (e2e). Angular
// component specs run through `ng test`, which has its own vitest set-up.
export default defineConfig({
  test: {
    // The longest files start first, so none runs alone at the end (test/support/slow-first-sequencer.ts).
    sequence: { sequencer: SlowFirstSequencer },
    projects: [
      {
        test: {
          name: 'shared',
          // The engine tests are pure: one module graph per worker instead of one per file. On the 2-core machine
          // the project went from 140 s (57 s of it importing) to 18 s, every test unchanged. A test that stubs
          // something restores it in afterEach (vi.restoreAllMocks), so no file sees another's stubs.
          isolate: false,
          // Two workers, as the server project (vitest refuses projects of one run with different maxWorkers
          // in one group; its default on 2 cores is 1).
          maxWorkers: 2,
          include: ['test/shared/**/*.test.ts'],
          environment: 'node',
          // No engine test is about wall time (speed is `npm run bench`'s job): the 5 s default failed a
          // corner-caution test at load 10, with the lanes and other work sharing 2 cores.
          testTimeout: 30_000,
        },
      },
      {
        test: {
          name: 'server',
          // One module graph per worker, as the engine tests: imports went from about 200 s to 13 s of the run.
          // Each file starts its own app on its own database copy (helpers.ts), so no file sees another's data.
          isolate: false,
          // Two files at a time (vitest's default on 2 cores is one): an API test waits on PostgreSQL, the
          // queue and HTTP as much as it computes (one file at a time kept about half of one core busy).
          maxWorkers: 2,
          include: ['test/server/**/*.test.ts'],
          environment: 'node',
          globalSetup: ['test/support/pg-global-setup.ts'],
          // A hang guard, not a speed check (speed is `npm run bench`'s): at load 14 (the suite beside other
          // work on 2 cores) three configuration-analysis tests took just over 30 s.
          testTimeout: 90_000,
          hookTimeout: 90_000,
        },
      },
      {
        test: {
          name: 'e2e',
          include: ['test/e2e/**/*.test.ts'],
          environment: 'node',
          // Once per run: the demo database template and one Chromium (each file copies the one, connects to the other).
          globalSetup: ['test/support/e2e-global-setup.ts'],
          // One module graph per worker, as the server tests: the server and playwright load once, not once per file
          // (about 2.5 s a file at load 10). Each file still starts its own server on its own database copy.
          isolate: false,
          // Two files at a time: each has its own server and database copy and its own browser contexts, so
          // they cannot see each other's data; a browser test waits on the server and the page as much as it
          // computes (one file alone kept about half of one core busy), so two together finish sooner.
          maxWorkers: 2,
          // A hang guard, not a speed check: the longest walk (review, four people) took over 90 s at load 12,
          // and the browser tests now run beside the unit tests.
          testTimeout: 180_000,
          hookTimeout: 120_000,
        },
      },
    ],
  },
});

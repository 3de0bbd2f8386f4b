/**
 * `npm test`: every suite on one throwaway PostgreSQL cluster, then one plain
 * closing line `N passed, N failed` summed over all runners.
 *   1. type check of shared/, server/ and test/ (tsc)
 *   2. vitest: engine (shared) and API (server, real PostgreSQL)
 *   3. Angular component specs (ng test: vitest + jsdom)
 *   4. production build of the app, then browser tests (playwright-core + Chromium)
 * A step that fails without reporting tests (a type error, a build error)
 * counts as one failure, so a broken step can never look green.
 */
import { mkdirSync, readFileSync, existsSync, rmSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { startThrowawayCluster } from './pg.js';
import { run, bin } from './run.js';

const root = resolve(import.meta.dirname, '..', '..');
process.chdir(root);
const results = join(root, 'test-results');
mkdirSync(results, { recursive: true });

interface Tally {
  step: string;
  passed: number;
  failed: number;
  /** Wall-clock seconds the step took. */
  seconds?: number;
}
const tallies: Tally[] = [];
const env: NodeJS.ProcessEnv = { ...process.env, NO_COLOR: '1', FORCE_COLOR: '0', NG_CLI_ANALYTICS: 'false' };

function stripAnsi(s: string): string {
  return s.replace(/\x1b\[[0-9;]*[A-Za-z]/g, '');
}

/** vitest's JSON report → counts; a file that failed to load counts as a failure. */
function vitestTally(step: string, file: string, code: number): Tally {
  if (!existsSync(file)) return { step, passed: 0, failed: code === 0 ? 0 : 1 };
  const r = JSON.parse(readFileSync(file, 'utf8')) as {
    numPassedTests: number;
    numFailedTests: number;
    testResults: { status: string; assertionResults: unknown[] }[];
  };
  const brokenFiles = r.testResults.filter((f) => f.status === 'failed' && f.assertionResults.length === 0).length;
  let failed = r.numFailedTests + brokenFiles;
  if (code !== 0 && failed === 0) failed = 1;
  return { step, passed: r.numPassedTests, failed };
}

/** ng test prints vitest's summary line: `Tests  2 failed | 40 passed (42)`. */
function ngTally(output: string, code: number): Tally {
  const lines = stripAnsi(output).split('\n').filter((l) => /^\s*Tests\s+\d/.test(l));
  let passed = 0;
  let failed = 0;
  for (const l of lines) {
    passed += Number(/(\d+) passed/.exec(l)?.[1] ?? 0);
    failed += Number(/(\d+) failed/.exec(l)?.[1] ?? 0);
  }
  if (code !== 0 && failed === 0) failed = 1;
  return { step: 'angular specs', passed, failed };
}

async function vitest(step: string, projects: string[]): Promise<void> {
  const out = join(results, `vitest-${step}.json`);
  rmSync(out, { force: true });
  const args = ['run', ...projects.flatMap((p) => ['--project', p]), '--reporter=default', '--reporter=json', `--outputFile.json=${out}`];
  const r = await run(bin('vitest'), args, env);
  tallies.push(vitestTally(step, out, r.code));
}

/** Runs one step and stamps the tallies it adds with the time it took. */
async function timed(step: () => Promise<void>): Promise<void> {
  const from = tallies.length;
  const t = Date.now();
  await step();
  for (const tally of tallies.slice(from)) tally.seconds = Math.round((Date.now() - t) / 1000);
}

async function main(): Promise<number> {
  const t0 = Date.now();
  console.log('[rollwise] starting a throwaway PostgreSQL cluster…');
  const cluster = await startThrowawayCluster('postgres_probe');
  env['ROLLWISE_TEST_PG_PORT'] = String(cluster.port);
  try {
    console.log('\n[rollwise] type check (tsc)…');
    await timed(async () => {
      const tsc = await run(bin('tsc'), ['-p', 'tsconfig.node.json'], env);
      tallies.push({ step: 'type check', passed: tsc.code === 0 ? 1 : 0, failed: tsc.code === 0 ? 0 : 1 });
    });

    console.log('\n[rollwise] engine and API tests (vitest)…');
    await timed(() => vitest('unit', ['shared', 'server']));

    console.log('\n[rollwise] Angular component specs (ng test)…');
    await timed(async () => {
      const ng = await run(bin('ng'), ['test', '--watch=false'], env);
      tallies.push(ngTally(ng.output, ng.code));
    });

    console.log('\n[rollwise] building the app for the browser tests…');
    const buildStart = Date.now();
    const build = await run(bin('ng'), ['build', '--configuration', 'production'], env);
    const buildSeconds = Math.round((Date.now() - buildStart) / 1000);
    if (build.code !== 0) {
      tallies.push({ step: 'app build', passed: 0, failed: 1, seconds: buildSeconds });
    } else {
      console.log(`\n[rollwise] browser tests (playwright-core + Chromium), after a ${buildSeconds} s build…`);
      await timed(() => vitest('e2e', ['e2e']));
    }
  } finally {
    cluster.remove();
  }
  const passed = tallies.reduce((s, t) => s + t.passed, 0);
  const failed = tallies.reduce((s, t) => s + t.failed, 0);
  console.log('\n[rollwise] summary');
  for (const t of tallies) {
    const time = t.seconds === undefined ? '' : ` in ${t.seconds} s`;
    console.log(`  ${t.step.padEnd(16)} ${t.passed} passed, ${t.failed} failed${time}`);
  }
  console.log(`  took ${Math.round((Date.now() - t0) / 1000)} s`);
  console.log(`${passed} passed, ${failed} failed`);
  return failed === 0 && passed > 0 ? 0 : 1;
}

main().then(
  (code) => process.exit(code),
  (err: unknown) => {
    console.error(`[rollwise] test run failed to start: ${err instanceof Error ? err.stack : String(err)}`);
    console.log('0 passed, 1 failed');
    process.exit(1);
  },
);

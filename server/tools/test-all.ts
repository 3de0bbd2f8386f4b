/**
 * `npm test`: every suite on one throwaway PostgreSQL cluster, then one plain
 * closing line `N passed, N failed` summed over all runners.
 *
 * Two lanes run side by side on one cluster (on 2 cores each waits on
 * PostgreSQL, HTTP or the browser as much as it computes, so the other lane
 * fills the gaps):
 *   lane 1: vitest: engine (shared) and API (server, real PostgreSQL), two
 *           files at a time
 *   lane 2: the production build of the app, then the browser tests
 *           (playwright-core + Chromium, two files at a time) against it
 * and the two runners that need nothing else, the Angular component specs
 * (ng test: vitest + jsdom) and the type check of shared/, server/ and test/
 * (tsc, with noUncheckedIndexedAccess and exactOptionalPropertyTypes), go to
 * whichever lane is free first (once the app build has ended: two Angular
 * builds never share the cache), the longer one first: so neither lane idles
 * while the other still has a queue, whichever of them is the long pole on
 * the machine at hand.
 * Each runner's output is held back and printed whole when it ends, under
 * its own heading, so two runners never interleave; a live line says when
 * each starts and ends. A step that fails without reporting tests (a type
 * error, a build error) counts as one failure, so a broken step can never
 * look green; the summary names each runner with its counts and time, and
 * repeats the heading of every runner that failed.
 */
import { spawn } from 'node:child_process';
import { mkdirSync, readFileSync, existsSync, rmSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { startThrowawayCluster } from './pg.js';
import { bin } from './run.js';

const root = resolve(import.meta.dirname, '..', '..');
process.chdir(root);
const results = join(root, 'test-results');
mkdirSync(results, { recursive: true });

interface Tally {
  step: string;
  passed: number;
  failed: number;
  /** Wall-clock seconds the runner took. */
  seconds: number;
}
const tallies: Tally[] = [];
const env: NodeJS.ProcessEnv = { ...process.env, NO_COLOR: '1', FORCE_COLOR: '0', NG_CLI_ANALYTICS: 'false' };
const t0 = Date.now();
const clock = () => `${Math.round((Date.now() - t0) / 1000)} s`.padStart(6);

function stripAnsi(s: string): string {
  return s.replace(/\x1b\[[0-9;]*[A-Za-z]/g, '');
}

interface Finished {
  code: number;
  output: string;
  seconds: number;
}

/**
 * Runs one runner with its output held back; prints it whole, under a
 * heading, when the runner ends (so runners side by side never interleave).
 */
function runner(step: string, cmd: string, args: string[]): Promise<Finished> {
  console.log(`[rollwise ${clock()}] ${step}: started`);
  const started = Date.now();
  return new Promise((done) => {
    const child = spawn(cmd, args, { env, stdio: ['ignore', 'pipe', 'pipe'] });
    let output = '';
    child.stdout.on('data', (c: Buffer) => (output += c.toString()));
    child.stderr.on('data', (c: Buffer) => (output += c.toString()));
    const finish = (code: number) => {
      const seconds = Math.round((Date.now() - started) / 1000);
      console.log(`\n[rollwise ${clock()}] ${step}: ended with exit code ${code} after ${seconds} s; its output:`);
      process.stdout.write(output.endsWith('\n') || output === '' ? output : output + '\n');
      console.log(`[rollwise ${clock()}] ${step}: end of output`);
      done({ code, output, seconds });
    };
    child.on('close', (code, signal) => finish(code ?? (signal ? 128 : 1)));
    child.on('error', (err) => {
      output += String(err);
      finish(127);
    });
  });
}

/** vitest's JSON report → counts; a file that failed to load counts as a failure. */
function vitestTally(step: string, file: string, r: Finished): Tally {
  if (!existsSync(file)) return { step, passed: 0, failed: r.code === 0 ? 0 : 1, seconds: r.seconds };
  const report = JSON.parse(readFileSync(file, 'utf8')) as {
    numPassedTests: number;
    numFailedTests: number;
    testResults: { status: string; assertionResults: unknown[] }[];
  };
  const brokenFiles = report.testResults.filter((f) => f.status === 'failed' && f.assertionResults.length === 0).length;
  let failed = report.numFailedTests + brokenFiles;
  if (r.code !== 0 && failed === 0) failed = 1;
  return { step, passed: report.numPassedTests, failed, seconds: r.seconds };
}

/** ng test prints vitest's summary line: `Tests  2 failed | 40 passed (42)`. */
function ngTally(r: Finished): Tally {
  const lines = stripAnsi(r.output).split('\n').filter((l) => /^\s*Tests\s+\d/.test(l));
  let passed = 0;
  let failed = 0;
  for (const l of lines) {
    passed += Number(/(\d+) passed/.exec(l)?.[1] ?? 0);
    failed += Number(/(\d+) failed/.exec(l)?.[1] ?? 0);
  }
  if (r.code !== 0 && failed === 0) failed = 1;
  return { step: 'angular specs', passed, failed, seconds: r.seconds };
}

/** A step that passes or fails as a whole (type check, build): one check. */
function wholeTally(step: string, r: Finished): Tally {
  return { step, passed: r.code === 0 ? 1 : 0, failed: r.code === 0 ? 0 : 1, seconds: r.seconds };
}

async function vitest(step: string, projects: string[]): Promise<Tally> {
  const out = join(results, `vitest-${step}.json`);
  rmSync(out, { force: true });
  const args = ['run', ...projects.flatMap((p) => ['--project', p]), '--reporter=default', '--reporter=json', `--outputFile.json=${out}`];
  return vitestTally(step, out, await runner(step, bin('vitest'), args));
}

/** The runners that need nothing but the sources, longest first: each lane takes the next one when it is free. */
const either: (() => Promise<Tally>)[] = [
  async () => ngTally(await runner('angular specs', bin('ng'), ['test', '--watch=false'])),
  async () => wholeTally('type check', await runner('type check', bin('tsc'), ['-p', 'tsconfig.node.json'])),
];

/** Settles when the app build has ended: no other Angular build (ng test's) runs beside it on the same cache. */
let buildEnded: () => void = () => undefined;
const built = new Promise<void>((done) => (buildEnded = done));

async function takeFromEither(): Promise<void> {
  await built;
  for (let next = either.shift(); next; next = either.shift()) tallies.push(await next());
}

/** Lane 1: the engine and API tests. */
async function unit(): Promise<void> {
  tallies.push(await vitest('unit', ['shared', 'server']));
}

/** Lane 2: the build the browser tests need, then the browser tests (none when the build fails: it counts as a failure). */
async function buildAndBrowser(): Promise<void> {
  const build = await runner('app build', bin('ng'), ['build', '--configuration', 'production']);
  buildEnded();
  // A good build is no test of its own (it counts nothing), but its time is in the summary.
  tallies.push(build.code === 0 ? { step: 'app build', passed: 0, failed: 0, seconds: build.seconds } : wholeTally('app build', build));
  if (build.code === 0) tallies.push(await vitest('e2e', ['e2e']));
}

async function main(): Promise<number> {
  console.log(`[rollwise ${clock()}] starting a throwaway PostgreSQL cluster…`);
  const cluster = await startThrowawayCluster('postgres_probe');
  env['ROLLWISE_TEST_PG_PORT'] = String(cluster.port);
  try {
    await Promise.all([unit().then(takeFromEither), buildAndBrowser().then(takeFromEither)]);
  } finally {
    cluster.remove();
  }
  const passed = tallies.reduce((s, t) => s + t.passed, 0);
  const failed = tallies.reduce((s, t) => s + t.failed, 0);
  console.log('\n[rollwise] summary (lane 1: unit; lane 2, beside it: build, browser tests; component specs and type check on the lane free first)');
  const order = ['unit', 'app build', 'e2e', 'angular specs', 'type check'];
  for (const t of [...tallies].sort((a, b) => order.indexOf(a.step) - order.indexOf(b.step))) {
    const counts = t.step === 'app build' && t.failed === 0 ? 'built' : `${t.passed} passed, ${t.failed} failed`;
    console.log(`  ${t.step.padEnd(16)} ${counts} in ${t.seconds} s`);
  }
  const broken = tallies.filter((t) => t.failed > 0).map((t) => t.step);
  if (broken.length) console.log(`  failed: ${broken.join(', ')} (each runner's output is above under "[rollwise …] <runner>: ended …")`);
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

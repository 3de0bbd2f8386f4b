/** Queue worker processes for tests and benches: `npm run worker` as a child process on a given database. */
import { spawn, type ChildProcess } from 'node:child_process';
import { resolve } from 'node:path';

const ROOT = resolve(import.meta.dirname, '..', '..');

export interface WorkerProcess {
  child: ChildProcess;
  pid: number;
  /** Resolves with the exit code or signal. */
  exited: Promise<string>;
  /** SIGTERM (finishes its job, then exits) and waits. */
  stop(): Promise<string>;
  /** SIGKILL: dies at once, mid-job. */
  kill(): Promise<string>;
}

/** Every worker started and not yet ended: killed when the test process exits, so a test that fails or times out leaves none behind. */
const alive = new Set<ChildProcess>();
process.once('exit', () => {
  for (const child of alive) child.kill('SIGKILL');
});

/** A worker that has not said it is running after this long is killed and the start fails (a hang guard, not a speed check). */
const START_BOUND_MS = 90_000;

/**
 * Starts a worker and waits until it takes jobs. `env` adds to a test environment (NODE_ENV=test: quick polling
 * and maintenance, and the worker at the test's own CPU priority: config `workerNice` and `computeNice`).
 */
export async function spawnWorker(databaseUrl: string, env: Record<string, string> = {}): Promise<WorkerProcess> {
  const child = spawn(process.execPath, ['--import', 'tsx', resolve(ROOT, 'server', 'worker.ts')], {
    cwd: ROOT,
    env: { ...process.env, NODE_ENV: 'test', LOG_LEVEL: 'silent', DATABASE_URL: databaseUrl, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  alive.add(child);
  const exited = new Promise<string>((res) =>
    child.once('exit', (code, signal) => {
      alive.delete(child);
      res(signal ?? `exit ${code}`);
    }),
  );
  let output = '';
  await new Promise<void>((res, rej) => {
    const bound = setTimeout(() => {
      child.kill('SIGKILL');
      rej(new Error(`the worker did not start within ${START_BOUND_MS / 1000} s (killed):\n${output}`));
    }, START_BOUND_MS);
    const onData = (b: Buffer) => {
      output += b.toString();
      if (output.includes('queue worker') && output.includes('is running')) {
        clearTimeout(bound);
        child.stdout.off('data', onData);
        res();
      }
    };
    child.stdout.on('data', onData);
    child.stderr.on('data', (b: Buffer) => (output += b.toString()));
    void exited.then((how) => {
      clearTimeout(bound);
      rej(new Error(`the worker exited (${how}) before it started:\n${output}`));
    });
  });
  child.stdout.resume();
  child.stderr.resume();
  const signal = (s: NodeJS.Signals) => {
    if (child.exitCode === null && child.signalCode === null) child.kill(s);
    return exited;
  };
  return { child, pid: child.pid!, exited, stop: () => signal('SIGTERM'), kill: () => signal('SIGKILL') };
}

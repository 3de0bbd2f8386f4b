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

/** Starts a worker and waits until it takes jobs. `env` adds to a test environment (NODE_ENV=test: quick polling and maintenance). */
export async function spawnWorker(databaseUrl: string, env: Record<string, string> = {}): Promise<WorkerProcess> {
  const child = spawn(process.execPath, ['--import', 'tsx', resolve(ROOT, 'server', 'worker.ts')], {
    cwd: ROOT,
    env: { ...process.env, NODE_ENV: 'test', LOG_LEVEL: 'silent', DATABASE_URL: databaseUrl, ...env },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  const exited = new Promise<string>((res) => child.once('exit', (code, signal) => res(signal ?? `exit ${code}`)));
  let output = '';
  await new Promise<void>((res, rej) => {
    const onData = (b: Buffer) => {
      output += b.toString();
      if (output.includes('queue worker') && output.includes('is running')) {
        child.stdout.off('data', onData);
        res();
      }
    };
    child.stdout.on('data', onData);
    child.stderr.on('data', (b: Buffer) => (output += b.toString()));
    void exited.then((how) => rej(new Error(`the worker exited (${how}) before it started:\n${output}`)));
  });
  child.stdout.resume();
  child.stderr.resume();
  const signal = (s: NodeJS.Signals) => {
    if (child.exitCode === null && child.signalCode === null) child.kill(s);
    return exited;
  };
  return { child, pid: child.pid!, exited, stop: () => signal('SIGTERM'), kill: () => signal('SIGKILL') };
}

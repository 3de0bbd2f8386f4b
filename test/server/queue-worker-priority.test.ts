/**
 * The CPU-priority deployment rule (docs/operations.md, "CPU priority"): a
 * worker process lowers its own priority by WORKER_NICE at start, every
 * thread of it, so the API on the same cores answers first; its study
 * threads add their own increment on top (capped at 19). Read from /proc
 * (Linux: a nice value belongs to a thread). Tests run workers at their own
 * priority (config `workerNice` 0 and `computeNice` off under NODE_ENV=test),
 * so these set the rule on as a deployment does; a small WORKER_NICE keeps
 * the lowered worker from waiting long behind the rest of the suite.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { afterEach, describe, expect, it } from 'vitest';
import { migratedDatabaseUrl } from '../support/db.js';
import { waitFor } from '../support/wait.js';
import { spawnWorker, type WorkerProcess } from '../support/workers.js';
import { PRIORITIES } from '../../server/compute/pool.js';
import { loadConfig } from '../../server/config.js';

/** The nice value of one thread of a process (field 19 of proc(5) stat). */
function threadNice(pid: number, tid: number): number {
  const stat = readFileSync(`/proc/${pid}/task/${tid}/stat`, 'utf8');
  return Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[16]);
}

/** The nice value of each thread of a process. */
function threadNices(pid: number): number[] {
  return readdirSync(`/proc/${pid}/task`).map((tid) => threadNice(pid, Number(tid)));
}

/**
 * The main thread's nice value: the thread whose id is the process id. Not the first thread listed: once
 * process ids wrap around (pid_max, 32 768 by default) a later thread can have a smaller id than its process.
 */
function mainNice(pid: number): number {
  return threadNice(pid, pid);
}

let worker: WorkerProcess | undefined;
afterEach(async () => {
  await worker?.stop();
  worker = undefined;
});

describe('worker process priority (Linux)', () => {
  it('a deployment lowers workers by default (WORKER_NICE 10, compute threads below their process); tests do not', () => {
    expect(loadConfig({ NODE_ENV: 'production', SESSION_SECRET: 'x'.repeat(40) })).toMatchObject({ workerNice: 10, computeNice: true });
    expect(loadConfig({})).toMatchObject({ workerNice: 10, computeNice: true });
    expect(loadConfig({ NODE_ENV: 'test' })).toMatchObject({ workerNice: 0, computeNice: false });
  });

  it('WORKER_NICE lowers every thread of the worker; the warmed study thread sits below that by its own increment', async () => {
    const before = mainNice(process.pid);
    worker = await spawnWorker(migratedDatabaseUrl(), { WORKER_NICE: '3', COMPUTE_NICE: 'true', WORKER_WARM_START: 'true' });
    const pid = worker.pid;
    const nices = threadNices(pid);
    // The main thread and every helper started before the rule ran, at least 3 below the parent.
    expect(mainNice(pid)).toBe(Math.min(19, before + 3));
    expect(Math.min(...nices)).toBe(Math.min(19, before + 3));
    // The study lane's thread (kept and warmed at start) adds its increment once it has started.
    const study = Math.min(19, before + 3 + PRIORITIES.studyChunk);
    await waitFor(`a thread of the worker at nice ${study}`, async () => (threadNices(pid).includes(study) ? true : undefined));
  }, 120_000);

  it('WORKER_NICE=0 leaves the worker where it was started', async () => {
    const before = mainNice(process.pid);
    worker = await spawnWorker(migratedDatabaseUrl(), { WORKER_NICE: '0' });
    expect(mainNice(worker.pid)).toBe(before);
  }, 120_000);
});

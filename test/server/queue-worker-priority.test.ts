/**
 * The CPU-priority deployment rule (docs/operations.md, "CPU priority"): a
 * worker process lowers its own priority by WORKER_NICE at start, every
 * thread of it, so the API on the same cores answers first; its study
 * threads add their own increment on top (capped at 19). Read from /proc
 * (Linux: a nice value belongs to a thread).
 */
import { readdirSync, readFileSync } from 'node:fs';
import { afterEach, describe, expect, it } from 'vitest';
import { migratedDatabaseUrl } from '../support/db.js';
import { spawnWorker, type WorkerProcess } from '../support/workers.js';
import { PRIORITIES } from '../../server/compute/pool.js';

/** The nice value of each thread of a process (field 19 of proc(5) stat). */
function threadNices(pid: number): number[] {
  return readdirSync(`/proc/${pid}/task`).map((tid) => {
    const stat = readFileSync(`/proc/${pid}/task/${tid}/stat`, 'utf8');
    return Number(stat.slice(stat.lastIndexOf(')') + 2).split(' ')[16]);
  });
}

let worker: WorkerProcess | undefined;
afterEach(async () => {
  await worker?.stop();
  worker = undefined;
});

describe('worker process priority (Linux)', () => {
  it('WORKER_NICE lowers every thread of the worker; the warmed study thread sits below that by its own increment', async () => {
    const before = threadNices(process.pid)[0]!;
    worker = await spawnWorker(migratedDatabaseUrl(), { WORKER_NICE: '7', WORKER_WARM_START: 'true' });
    const nices = threadNices(worker.pid);
    // The main thread and every helper started before the rule ran, at least 7 below the parent.
    expect(nices[0]).toBe(Math.min(19, before + 7));
    expect(Math.min(...nices)).toBe(Math.min(19, before + 7));
    // The study lane's thread (kept and warmed at start) adds its increment.
    expect(nices).toContain(Math.min(19, before + 7 + PRIORITIES.studyChunk));
  }, 60_000);

  it('WORKER_NICE=0 leaves the worker where it was started', async () => {
    const before = threadNices(process.pid)[0]!;
    worker = await spawnWorker(migratedDatabaseUrl(), { WORKER_NICE: '0' });
    expect(threadNices(worker.pid)[0]).toBe(before);
  }, 60_000);
});

/**
 * The worker-thread pool for engine calls (piscina). Each task has a time
 * limit: when it runs out the task is aborted (piscina ends that worker
 * thread, so a runaway solve cannot keep a core) and the caller gets a
 * SolveError `time_limit`. A full queue is 503 `compute_busy`.
 */
import { MessageChannel } from 'node:worker_threads';
import { Piscina } from 'piscina';
import { DomainError, SolveError } from '../../shared/errors.js';
import { deserializeError, type ComputeTask, type TaskKind, type ProgressMessage, type WorkerOutcome } from './tasks.js';

export interface RunOptions {
  timeLimitMs: number;
  onProgress?: (m: ProgressMessage) => void;
  /** Aborts the task early (a cancelled job). */
  signal?: AbortSignal;
}

export interface ComputePool {
  run(kind: TaskKind, input: unknown, o: RunOptions): Promise<unknown>;
  /** The same, with the result as JSON text made in the worker (for routes that only send it on). */
  runJson(kind: TaskKind, input: unknown, o: RunOptions): Promise<string>;
  close(): Promise<void>;
}

const WORKER = new URL('./worker.ts', import.meta.url).href;

/**
 * Thread priorities (nice increments, higher runs later): an API request's own computation, then a user's
 * queued solve, then study chunks. The main threads (HTTP, queue) stay at the process's priority.
 */
export const PRIORITIES = { request: 2, solveJob: 5, studyChunk: 10 } as const;

/**
 * `warm`: start one worker right away (loading the engines takes about a second) instead of at the first request;
 * `keepThreads`: start and keep all `threads` (a queue worker's study lanes, each with its thread warmed up at start);
 * `niceIncrement`: the threads' scheduling priority below the process's (Linux nice, per thread, through piscina
 * and @napi-rs/nice), so that on a shared machine the event loops answering requests and taking jobs run first
 * and long computations take the cores that are left (PRIORITIES below).
 */
export function createComputePool(o: { threads: number; maxQueue?: number; warm?: boolean; keepThreads?: boolean; niceIncrement?: number }): ComputePool {
  // Workers run the TypeScript sources through tsx, like the main process.
  const hasTsx = process.execArgv.some((a, i, all) => a.includes('tsx') && (all[i - 1] === '--import' || a.startsWith('--import')));
  let pool: Piscina | undefined;
  const get = () =>
    (pool ??= new Piscina({
      filename: WORKER,
      minThreads: o.keepThreads ? o.threads : o.warm ? 1 : 0,
      maxThreads: o.threads,
      maxQueue: o.maxQueue ?? 64,
      idleTimeout: 60_000,
      niceIncrement: o.niceIncrement ?? 0,
      execArgv: hasTsx ? process.execArgv : [...process.execArgv, '--import', 'tsx'],
    }));

  if (o.warm || o.keepThreads) get();
  return {
    async run(kind: TaskKind, input: unknown, opts: RunOptions): Promise<unknown> {
      return exec({ kind, input }, opts);
    },
    async runJson(kind: TaskKind, input: unknown, opts: RunOptions): Promise<string> {
      return (await exec({ kind, input, asJson: true }, opts)) as string;
    },
    async close() {
      await pool?.destroy();
      pool = undefined;
    },
  };

  async function exec(task: ComputeTask, opts: RunOptions): Promise<unknown> {
    const timer = new AbortController();
    const timeout = setTimeout(() => timer.abort(), opts.timeLimitMs);
    const signal = opts.signal ? AbortSignal.any([timer.signal, opts.signal]) : timer.signal;
    let port: MessageChannel | undefined;
    const transferList = [];
    if (opts.onProgress) {
      port = new MessageChannel();
      port.port1.on('message', opts.onProgress);
      task.progressPort = port.port2;
      transferList.push(port.port2);
    }
    try {
      const out = (await get().run(task, { signal, transferList })) as WorkerOutcome;
      if (!out.ok) throw deserializeError(out.error);
      return 'json' in out ? out.json : out.result;
    } catch (err) {
      if (timer.signal.aborted) {
        throw new SolveError('time_limit', `The computation did not finish within ${Math.round(opts.timeLimitMs / 1000)} s; reduce the range or step count`, {
          timeLimitMs: opts.timeLimitMs,
        });
      }
      if (opts.signal?.aborted) throw new DomainError('conflict', 'cancelled', 'The computation was cancelled');
      if (err instanceof Error && /queue is at limit/i.test(err.message)) {
        throw new DomainError('unavailable', 'compute_busy', 'The server is busy with other computations; try again in a moment');
      }
      throw err;
    } finally {
      clearTimeout(timeout);
      port?.port1.close();
    }
  }
}

/**
 * The queue worker: takes jobs off the pg-boss queues and runs them on a
 * piscina thread pool of this process (so the event loop stays free for
 * the queue, progress writes and cancel notifications).
 *
 * Lanes, each taking one job at a time:
 * - `solveSlots` solve lanes (queue `solve`, then the dead-letter queue):
 *   a user's solve never waits behind study chunks; it shares the cores
 *   with them at the operating system's discretion.
 * - `studySlots` study lanes (queue `study-combine` first, then
 *   `study-chunk`, whose priority −chunkIndex makes studies take turns),
 *   each with a thread of its own (warmed up at start). A study lane keeps
 *   its thread busy: shortly before a chunk is expected to finish it takes
 *   and checks the next job, and the finished chunk lands while the next
 *   one computes.
 * A lane that finds work asks again at once; an idle lane sleeps until a
 * NOTIFY on `rollwise_queue` or `pollMs`.
 *
 * A job that throws is failed back to pg-boss, which retries it (on any
 * worker) up to its retry limit; a worker that dies mid-job leaves it
 * active until its expiry, when pg-boss maintenance (supervised by every
 * worker, run by one per interval) hands it to another. Engine errors are
 * answers, not failures: they are written to the job or study and the queue
 * job completes.
 */
import { hostname } from 'node:os';
import pg from 'pg';
import type PgBoss from 'pg-boss';
import type { Database } from '../db/client.js';
import { toErrorBody } from '../http/errors.js';
import { createComputePool, PRIORITIES, type ComputePool } from './pool.js';
import { cancelStudyChunks } from '../services/studies.js';
import { JobQueue, NOTIFY_CHANNEL, QUEUES, type QueueJobData } from './queue.js';
import { beginChunk, computeChunk, landChunk, type ChunkWork } from './study-handlers.js';
import { reconcileStudies, type ReconcileOutcome } from './reconcile.js';

export interface RunnerOptions {
  databaseUrl: string;
  solveSlots: number;
  studySlots: number;
  /** Idle lanes look for work this often even without a notification. */
  pollMs: number;
  maintenanceIntervalSeconds: number;
  /** Time limit of one study chunk on a thread. */
  chunkTimeLimitMs: number;
  /** Reconciliation of running studies with the queue (reconcile.ts): how often, the chunk jobs' expiry, and the stall bound. */
  reconcileSeconds: number;
  chunkExpireSeconds: number;
  stallSeconds: number;
  /** Start the threads at once (worker processes) rather than at the first job (a worker inside the server). */
  warm?: boolean;
  /** Solve and study threads run below the process (PRIORITIES); config `computeNice`. */
  niceThreads: boolean;
  logger?: { info(o: object, m: string): void; warn(o: object, m: string): void };
}

/** What a queue handler may use. */
export interface RunnerContext {
  db: Database;
  boss: PgBoss;
  queue: JobQueue;
  /** Threads of the solve lanes. */
  pool: ComputePool;
  /** Threads of the study lanes (one per lane). */
  studyPool: ComputePool;
  workerName: string;
  options: RunnerOptions;
  /** An AbortSignal that fires when `cancel:<key>` is notified (until `release`). */
  watchCancel(key: string): { signal: AbortSignal; release(): void };
}

/** A job a study lane took; a chunk job with the outcome of its check. */
interface Taken {
  name: string;
  job: PgBoss.JobWithMetadata<QueueJobData>;
  work?: ChunkWork | null;
  beginError?: { err: unknown };
}

/** A study lane takes its next job at least this long before its thread is expected to be free. */
const AHEAD_LEAD_MS = 50;

export type QueueHandler = (ctx: RunnerContext, job: PgBoss.JobWithMetadata<QueueJobData>) => Promise<void>;

export interface RunnerStats {
  jobs: number;
  failures: number;
}

export class QueueRunner {
  readonly workerName = `${hostname()}:${process.pid}`;
  readonly stats: RunnerStats = { jobs: 0, failures: 0 };
  private readonly queue: JobQueue;
  private readonly pool: ComputePool;
  private readonly studyPool: ComputePool;
  private listener: pg.Client | undefined;
  private stopping = false;
  private readonly lanes: Promise<void>[] = [];
  private readonly wakers = new Set<() => void>();
  /** Counts `wake` notifications, so a lane that was busy when one arrived does not then sleep through it. */
  private wakeSeq = 0;
  private readonly cancels = new Map<string, Set<AbortController>>();
  private ctx!: RunnerContext;
  private reconcileTimer: NodeJS.Timeout | undefined;
  private reconciling: Promise<unknown> = Promise.resolve();

  constructor(
    private readonly db: Database,
    private readonly o: RunnerOptions,
    private readonly handlers: Partial<Record<string, QueueHandler>>,
  ) {
    this.queue = new JobQueue(db.pool, { supervise: true, maintenanceIntervalSeconds: o.maintenanceIntervalSeconds });
    this.pool = createComputePool({ threads: o.solveSlots, maxQueue: 1024, warm: o.warm ?? true, niceIncrement: o.niceThreads ? PRIORITIES.solveJob : 0 });
    this.studyPool = createComputePool({ threads: o.studySlots, maxQueue: 1024, keepThreads: o.warm ?? true, niceIncrement: o.niceThreads ? PRIORITIES.studyChunk : 0 });
  }

  async start(): Promise<void> {
    const boss = await this.queue.ready();
    this.ctx = {
      db: this.db,
      boss,
      queue: this.queue,
      pool: this.pool,
      studyPool: this.studyPool,
      workerName: this.workerName,
      options: this.o,
      watchCancel: (key) => this.watchCancel(key),
    };
    await this.listen();
    // Each study thread solves a small built-in study first: its first real chunk then runs compiled code.
    if (this.o.warm ?? true) {
      const t0 = performance.now();
      await Promise.all(Array.from({ length: this.o.studySlots }, () => this.studyPool.run('study-warm', null, { timeLimitMs: 60_000 }).catch(() => undefined)));
      this.o.logger?.info({ ms: Math.round(performance.now() - t0) }, 'study threads warmed up');
    }
    for (let i = 0; i < this.o.solveSlots; i++) this.lanes.push(this.lane([QUEUES.solve, QUEUES.lost]));
    for (let i = 0; i < this.o.studySlots; i++) this.lanes.push(this.studyLane());
    this.reconcileTimer = setInterval(() => {
      this.reconciling = this.reconcile();
    }, this.o.reconcileSeconds * 1000);
    this.reconcileTimer.unref();
  }

  /** One reconciliation pass (reconcile.ts); errors are logged, the next pass tries again. */
  async reconcile(): Promise<ReconcileOutcome | undefined> {
    try {
      const r = await reconcileStudies(this.ctx, { chunkExpireSeconds: this.o.chunkExpireSeconds, stallSeconds: this.o.stallSeconds });
      if (r.requeuedChunks || r.resentCombines || r.failedStudies) this.o.logger?.warn({ ...r }, 'study reconciliation: chunks had left the queue undone');
      return r;
    } catch (err) {
      this.o.logger?.warn({ err }, 'study reconciliation failed; next pass retries');
      return undefined;
    }
  }

  /** Stops taking jobs, lets the running ones finish (or abandons them after `graceMs`), and closes. */
  async stop(graceMs = 30_000): Promise<void> {
    if (this.stopping) return;
    this.stopping = true;
    clearInterval(this.reconcileTimer);
    for (const w of this.wakers) w();
    let timer: NodeJS.Timeout | undefined;
    await Promise.race([Promise.all([...this.lanes, this.reconciling]), new Promise((r) => (timer = setTimeout(r, graceMs)))]);
    clearTimeout(timer);
    const l = this.listener;
    this.listener = undefined;
    await l?.end().catch(() => undefined);
    await this.queue.stop();
    await this.pool.close();
    await this.studyPool.close();
  }

  private async lane(names: string[]): Promise<void> {
    while (!this.stopping) {
      const seen = this.wakeSeq;
      let worked = false;
      for (const name of names) {
        if (this.stopping) break;
        const handler = this.handlers[name];
        if (!handler) continue;
        let jobs: PgBoss.JobWithMetadata<QueueJobData>[] = [];
        try {
          jobs = await this.ctx.boss.fetch<QueueJobData>(name, { batchSize: 1, includeMetadata: true });
        } catch (err) {
          this.o.logger?.warn({ err, queue: name }, 'could not fetch from the queue');
        }
        const job = jobs[0];
        if (!job) continue;
        worked = true;
        await this.runOne(name, handler, job);
        break; // Back to the first queue of the lane: it has precedence.
      }
      if (!worked && !this.stopping) await this.idle(seen);
    }
  }

  /** The first job waiting on `names`, in that order of precedence. */
  private async fetchFirst(names: string[]): Promise<{ name: string; job: PgBoss.JobWithMetadata<QueueJobData> } | undefined> {
    for (const name of names) {
      if (this.stopping) return undefined;
      try {
        const [job] = await this.ctx.boss.fetch<QueueJobData>(name, { batchSize: 1, includeMetadata: true });
        if (job) return { name, job };
      } catch (err) {
        this.o.logger?.warn({ err, queue: name }, 'could not fetch from the queue');
      }
    }
    return undefined;
  }

  /** The first job waiting on `names`; a chunk job comes checked (beginChunk: `work`, null when there is nothing to do). */
  private async take(names: string[]): Promise<Taken | undefined> {
    const next = await this.fetchFirst(names);
    if (!next || next.name !== QUEUES.studyChunk) return next;
    this.stats.jobs++;
    try {
      return { ...next, work: await beginChunk(this.ctx, next.job) };
    } catch (err) {
      return { ...next, beginError: { err } };
    }
  }

  /**
   * A study lane: combine jobs first, then chunks. A chunk runs in three
   * phases (study-handlers.ts): check, compute on the lane's thread, land.
   * Shortly before a chunk is expected to finish (the lane's last compute
   * time less a lead of twice the last take, at least AHEAD_LEAD_MS), the
   * lane takes and checks the next job, and the computed chunk lands while
   * the next one computes (one landing at a time): the thread does not wait
   * for the database between chunks, and a job taken ahead waits only that
   * lead for its thread, so at a study's end the last chunks are not held by
   * one busy lane while another lane is idle. A job taken ahead is run even
   * when the worker is stopping (it would otherwise wait for its expiry).
   */
  private async studyLane(): Promise<void> {
    const names = [QUEUES.studyCombine, QUEUES.studyChunk];
    let ahead: Promise<Taken | undefined> | undefined;
    let landing: Promise<void> = Promise.resolve();
    // The wake count when the fetch that `ahead` holds began: a job queued after that (a combine job sent by
    // this lane's own landing, say) has woken the lane by the time it would sleep, so it looks again at once.
    let seen = this.wakeSeq;
    // This lane's last chunk compute and job take, in ms: when to take the next job.
    let lastComputeMs = 0;
    let lastTakeMs = 0;
    const takeAhead = () => {
      if (ahead || this.stopping) return;
      seen = this.wakeSeq;
      const t0 = performance.now();
      ahead = this.take(names).finally(() => (lastTakeMs = performance.now() - t0));
    };
    while (!this.stopping || ahead) {
      if (!ahead) seen = this.wakeSeq;
      const next = await (ahead ?? this.take(names));
      ahead = undefined;
      if (!next) {
        await landing;
        if (!this.stopping) await this.idle(seen);
        continue;
      }
      const { name, job } = next;
      if (name !== QUEUES.studyChunk) {
        await landing;
        const handler = this.handlers[name];
        if (handler) await this.runOne(name, handler, job);
        continue;
      }
      if (next.beginError) {
        await this.failJob(name, job, next.beginError.err);
        continue;
      }
      const work = next.work;
      if (!work) {
        await this.completeJob(name, job);
        continue;
      }
      const computing = computeChunk(this.ctx, work);
      // Take the next job while this one computes, timed to be ready when the thread is free.
      const lead = Math.max(AHEAD_LEAD_MS, 2 * lastTakeMs);
      const timer = lastComputeMs > lead ? setTimeout(takeAhead, lastComputeMs - lead) : undefined;
      if (!timer) takeAhead();
      let done: Awaited<ReturnType<typeof computeChunk>>;
      try {
        done = await computing;
      } catch (err) {
        await this.failJob(name, job, err);
        continue;
      } finally {
        clearTimeout(timer);
      }
      if (done) lastComputeMs = done.computeMs;
      await landing;
      landing = (done ? landChunk(this.ctx, work, done.chunk, done.computeMs) : Promise.resolve()).then(
        () => this.completeJob(name, job),
        (err: unknown) => this.failJob(name, job, err),
      );
    }
    await landing;
  }

  private async completeJob(name: string, job: PgBoss.JobWithMetadata<QueueJobData>): Promise<void> {
    try {
      await this.ctx.boss.complete(name, job.id);
    } catch (err) {
      // Not told: the job expires and runs again, and its landed chunk is recognised (study_chunks key).
      this.o.logger?.warn({ err, queue: name, job: job.id }, 'could not mark the queue job done');
    }
  }

  private async failJob(name: string, job: PgBoss.JobWithMetadata<QueueJobData>, err: unknown): Promise<void> {
    this.stats.failures++;
    this.o.logger?.warn({ err, queue: name, job: job.id }, 'queue job failed; pg-boss retries it');
    const b = toErrorBody(err);
    await this.ctx.boss.fail(name, job.id, { code: b.code, message: b.message }).catch(() => undefined);
  }

  private async runOne(name: string, handler: QueueHandler, job: PgBoss.JobWithMetadata<QueueJobData>): Promise<void> {
    this.stats.jobs++;
    try {
      await handler(this.ctx, job);
      await this.ctx.boss.complete(name, job.id);
    } catch (err) {
      this.stats.failures++;
      this.o.logger?.warn({ err, queue: name, job: job.id }, 'queue job failed; pg-boss retries it');
      const b = toErrorBody(err);
      await this.ctx.boss.fail(name, job.id, { code: b.code, message: b.message }).catch(() => undefined);
    }
  }

  /** Sleeps until a wake notification or `pollMs`; at once if a wake came since `seen` was read. */
  private idle(seen: number): Promise<void> {
    if (this.wakeSeq !== seen) return Promise.resolve();
    return new Promise((resolve) => {
      const done = () => {
        clearTimeout(t);
        this.wakers.delete(done);
        resolve();
      };
      const t = setTimeout(done, this.o.pollMs);
      this.wakers.add(done);
    });
  }

  private watchCancel(key: string): { signal: AbortSignal; release(): void } {
    const c = new AbortController();
    let set = this.cancels.get(key);
    if (!set) this.cancels.set(key, (set = new Set()));
    set.add(c);
    return {
      signal: c.signal,
      release: () => {
        set.delete(c);
        if (set.size === 0) this.cancels.delete(key);
      },
    };
  }

  /** LISTEN on its own connection; reconnects after a loss (polling covers the gap). */
  private async listen(): Promise<void> {
    if (this.stopping) return;
    const client = new pg.Client({ connectionString: this.o.databaseUrl });
    const retry = () => {
      if (this.listener !== client) return;
      this.listener = undefined;
      client.end().catch(() => undefined);
      setTimeout(() => void this.listen(), 1000).unref();
    };
    client.on('error', retry);
    client.on('end', retry);
    client.on('notification', (n) => {
      const p = n.payload ?? '';
      if (p === 'wake') {
        this.wakeSeq++;
        for (const w of [...this.wakers]) w();
      } else if (p.startsWith('cancel:')) {
        for (const c of this.cancels.get(p.slice(7)) ?? []) c.abort();
      }
    });
    try {
      await client.connect();
      await client.query(`LISTEN ${NOTIFY_CHANNEL}`);
      this.listener = client;
    } catch (err) {
      this.o.logger?.warn({ err }, 'could not listen for queue notifications; polling');
      client.end().catch(() => undefined);
      if (!this.stopping) setTimeout(() => void this.listen(), 1000).unref();
    }
  }
}

/** The solve lane: runs the engine on a thread, writes progress (a few times a second) and the answer to the job row. */
export const solveHandler: QueueHandler = async (ctx, job) => {
  const data = job.data;
  if (data.kind !== 'solve') return;
  const id = data.jobId;
  const started = await ctx.db.pool.query(
    `UPDATE compute_jobs SET state = 'running', started_at = coalesce(started_at, now()), progress_message = 'Started'
      WHERE id = $1 AND state IN ('queued', 'running') RETURNING id`,
    [id],
  );
  // Cancelled (or gone) before a worker got to it.
  if (started.rowCount === 0) return;
  const watch = ctx.watchCancel(id);
  let last = 0;
  let pending: { fraction: number; message: string } | undefined;
  let writing: Promise<unknown> = Promise.resolve();
  const writeProgress = () => {
    if (!pending) return;
    const p = pending;
    pending = undefined;
    last = Date.now();
    writing = writing.then(() =>
      ctx.db.pool
        .query(`UPDATE compute_jobs SET progress_fraction = $2, progress_message = $3 WHERE id = $1 AND state = 'running'`, [id, p.fraction, p.message])
        .catch(() => undefined),
    );
  };
  try {
    let outcome: { ok: true; json: string } | { ok: false; err: unknown };
    try {
      const json = await ctx.pool.runJson('solve', data.input, {
        timeLimitMs: data.timeLimitMs,
        signal: watch.signal,
        onProgress: (m) => {
          if (m.type !== 'progress') return;
          pending = { fraction: Math.min(1, Math.max(0, m.fraction)), message: m.message };
          if (Date.now() - last > 250) writeProgress();
        },
      });
      outcome = { ok: true, json };
    } catch (err) {
      outcome = { ok: false, err };
    }
    await writing;
    if (watch.signal.aborted) return; // Cancelled: the row already says so.
    if (outcome.ok) {
      await ctx.db.pool.query(
        `UPDATE compute_jobs SET state = 'succeeded', result_json = $2, progress_fraction = 1, progress_message = 'Done', finished_at = now()
          WHERE id = $1 AND state = 'running'`,
        [id, outcome.json],
      );
    } else {
      const b = toErrorBody(outcome.err);
      // The database itself failing is not the engine's answer: let pg-boss retry.
      if (b.status === 503 && b.code === 'database_unavailable') throw outcome.err;
      const error = { status: b.status, code: b.code, message: b.message, ...(b.details !== undefined ? { details: b.details } : {}) };
      await ctx.db.pool.query(`UPDATE compute_jobs SET state = 'failed', error = $2, finished_at = now() WHERE id = $1 AND state = 'running'`, [id, error]);
    }
  } finally {
    watch.release();
  }
};

/** The dead-letter lane: a job whose retries ran out is marked lost, so its owner gets 410 job_gone with the reason. */
export const lostHandler: QueueHandler = async (ctx, job) => {
  const data = job.data;
  if (data.kind === 'solve') {
    await ctx.db.pool.query(
      `UPDATE compute_jobs SET state = 'failed', gone_reason = 'lost', finished_at = now() WHERE id = $1 AND state IN ('queued', 'running')`,
      [data.jobId],
    );
  } else if (data.kind === 'study-chunk' || data.kind === 'study-combine') {
    const what = data.kind === 'study-chunk' ? `chunk ${data.chunkIndex + 1}` : 'the final combination';
    await ctx.db.pool.query(
      `UPDATE studies SET status = 'failed', finished_at = now(), error = $2 WHERE id = $1 AND status IN ('queued', 'running')`,
      [
        data.studyId,
        {
          code: 'job_gone',
          message: `The study was lost: the workers running ${what} stopped before finishing it, more often than the retry limit allows. Start the study again.`,
        },
      ],
    );
    const { rows } = await ctx.db.pool.query<{ total_chunks: number }>('SELECT total_chunks FROM studies WHERE id = $1', [data.studyId]);
    if (rows[0]) await cancelStudyChunks(ctx.queue, data.studyId, rows[0].total_chunks);
  }
};

/**
 * Background solve jobs with polled progress, on the job queue. The job's
 * row (compute_jobs) is what its owner polls; the work travels on the
 * pg-boss `solve` queue under the same id, and whichever worker process
 * takes it writes progress and the answer back to the row
 * (server/compute/runner.ts). A server restart loses nothing: the row and
 * the queued job are in PostgreSQL.
 *
 * A job that can no longer give its answer answers 410 `job_gone` with the
 * reason: its result was dropped `retainMs` after it finished (`expired`),
 * or the queue lost it (its workers died more often than the retry limit,
 * or the queue's own retention dropped it while it waited: `lost`). The row
 * stays as a tombstone for `tombstoneMs`, so the id never looks wrong.
 */
import { and, eq, inArray, lt, sql } from 'drizzle-orm';
import { DomainError, notFound } from '../../shared/errors.js';
import type { Database } from '../db/client.js';
import { computeJobs } from '../db/schema.js';
import { QUEUES, bossDb, inTransaction, type JobQueue, type QueueJobData } from './queue.js';

export type JobState = 'queued' | 'running' | 'succeeded' | 'failed' | 'cancelled';

/** What GET /api/compute/solve-jobs/:id shows (the result goes on as the worker's JSON text). */
export interface JobView {
  id: string;
  state: JobState;
  progress: { fraction: number; message: string };
  /** The engine's answer as JSON text (succeeded jobs). */
  resultJson?: string;
  /** As the direct call would have answered. */
  error?: { code: string; message: string; details?: unknown; status: number };
  createdAt: Date;
  finishedAt?: Date;
}

export interface SolveJobOptions {
  timeLimitMs: number;
  maxActivePerUser?: number;
  /** How long a finished job keeps its answer. */
  retainMs?: number;
  /** How long the tombstone of an expired or lost job answers 410 before the id is forgotten. */
  tombstoneMs?: number;
}

type Row = typeof computeJobs.$inferSelect;

const GONE_MESSAGES = {
  expired: (retainMs: number) =>
    `This solve job finished more than ${Math.round(retainMs / 60_000)} minutes ago and its result is no longer kept; start the solve again`,
  lost: () => 'This solve job was lost: the workers running it stopped before it finished; start the solve again',
};

export class SolveJobs {
  private readonly sweeper: NodeJS.Timeout;
  private readonly retainMs: number;
  private readonly tombstoneMs: number;

  constructor(
    private readonly db: Database,
    private readonly queue: JobQueue,
    private readonly o: SolveJobOptions,
  ) {
    this.retainMs = o.retainMs ?? 15 * 60_000;
    this.tombstoneMs = o.tombstoneMs ?? 30 * 24 * 3_600_000;
    this.sweeper = setInterval(() => void this.sweep().catch(() => undefined), 60_000);
    this.sweeper.unref();
  }

  async start(ownerId: string, input: unknown): Promise<JobView> {
    const [{ active } = { active: 0 }] = await this.db.orm
      .select({ active: sql<number>`count(*)::int` })
      .from(computeJobs)
      .where(and(eq(computeJobs.ownerId, ownerId), inArray(computeJobs.state, ['queued', 'running'])));
    if (active >= (this.o.maxActivePerUser ?? 3)) {
      throw new DomainError('too_many', 'too_many_jobs', 'You already have several solves running; wait for one to finish or cancel it');
    }
    const boss = await this.queue.ready();
    // The row and the queue job land together or not at all.
    const id = (await inTransaction(this.db.pool, async (client) => {
      const ins = await client.query<{ id: string }>(`INSERT INTO compute_jobs (owner_id, kind) VALUES ($1, 'solve') RETURNING id`, [ownerId]);
      const jobId = ins.rows[0]!.id;
      const data: QueueJobData = { kind: 'solve', jobId, input, timeLimitMs: this.o.timeLimitMs };
      await boss.send(QUEUES.solve, data, {
        id: jobId,
        // One more try on another worker if the first one dies; the engine's own errors are answers, not retries.
        retryLimit: 1,
        retryDelay: 1,
        // A worker that died is noticed this long after it took the job (the time limit stops a live one first).
        expireInSeconds: Math.ceil(this.o.timeLimitMs / 1000) + 30,
        deadLetter: QUEUES.lost,
        db: bossDb(client),
      });
      await this.queue.notify('wake', client);
      return jobId;
    }))!;
    const [row] = await this.db.orm.select().from(computeJobs).where(eq(computeJobs.id, id));
    return view(row!);
  }

  async get(ownerId: string, id: string): Promise<JobView> {
    return view(await this.live(await this.owned(ownerId, id)));
  }

  async cancel(ownerId: string, id: string): Promise<JobView> {
    const row = await this.live(await this.owned(ownerId, id));
    if (row.state !== 'queued' && row.state !== 'running') return view(row);
    const [updated] = await this.db.orm
      .update(computeJobs)
      .set({ state: 'cancelled', progressMessage: 'Cancelled', finishedAt: new Date() })
      .where(and(eq(computeJobs.id, id), inArray(computeJobs.state, ['queued', 'running'])))
      .returning();
    if (updated) {
      const boss = await this.queue.ready();
      await boss.cancel(QUEUES.solve, id);
      // The worker running it (if any) stops the computation.
      await this.queue.notify(`cancel:${id}`);
      return view(updated);
    }
    // It finished meanwhile.
    return this.get(ownerId, id);
  }

  close(): void {
    clearInterval(this.sweeper);
  }

  private async owned(ownerId: string, id: string): Promise<Row> {
    const [row] = await this.db.orm.select().from(computeJobs).where(eq(computeJobs.id, id));
    // Someone else's job is as invisible as a missing one.
    if (!row || row.ownerId !== ownerId) throw notFound('Solve job');
    return row;
  }

  /** The row, or 410 when its answer is gone (marking it so on the way). */
  private async live(row: Row): Promise<Row> {
    if (row.goneReason) throw this.gone(row.goneReason);
    if (row.finishedAt && row.finishedAt.getTime() + this.retainMs < Date.now()) {
      await this.markGone(row.id, 'expired');
      throw this.gone('expired');
    }
    if (row.state === 'queued' || row.state === 'running') {
      // The row says waiting or running: ask the queue whether anyone still has it.
      const boss = await this.queue.ready();
      const job = await boss.getJobById(QUEUES.solve, row.id);
      if (!job || job.state === 'failed' || job.state === 'cancelled' || job.state === 'completed') {
        // Re-read: a worker may have finished it between our two reads.
        const [again] = await this.db.orm.select().from(computeJobs).where(eq(computeJobs.id, row.id));
        if (again && again.state !== 'queued' && again.state !== 'running') return this.live(again);
        await this.markGone(row.id, 'lost');
        throw this.gone('lost');
      }
    }
    return row;
  }

  private gone(reason: 'expired' | 'lost'): DomainError {
    return new DomainError('gone', 'job_gone', GONE_MESSAGES[reason](this.retainMs), { reason });
  }

  private async markGone(id: string, reason: 'expired' | 'lost'): Promise<void> {
    await this.db.orm
      .update(computeJobs)
      .set({
        goneReason: reason,
        resultJson: null,
        ...(reason === 'lost' ? { state: 'failed' as const, finishedAt: new Date() } : {}),
      })
      .where(eq(computeJobs.id, id));
  }

  /** Drops answers past their retention (tombstones stay) and forgets old tombstones. */
  async sweep(): Promise<void> {
    const now = Date.now();
    await this.db.orm
      .update(computeJobs)
      .set({ goneReason: 'expired', resultJson: null })
      .where(and(lt(computeJobs.finishedAt, new Date(now - this.retainMs)), sql`${computeJobs.goneReason} IS NULL`));
    await this.db.orm.delete(computeJobs).where(lt(computeJobs.finishedAt, new Date(now - this.tombstoneMs)));
  }
}

function view(r: Row): JobView {
  const v: JobView = { id: r.id, state: r.state, progress: { fraction: r.progressFraction, message: r.progressMessage }, createdAt: r.createdAt };
  if (r.resultJson !== null) v.resultJson = r.resultJson;
  if (r.error) v.error = r.error;
  if (r.finishedAt) v.finishedAt = r.finishedAt;
  return v;
}

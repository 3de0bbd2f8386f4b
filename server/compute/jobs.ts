/**
 * Background solve jobs with polled progress. Kept in memory: a job lives
 * for the lifetime of the server process (a restart loses running jobs; the
 * client re-submits) and is forgotten `retainMs` after it finishes.
 */
import { randomUUID } from 'node:crypto';
import { HttpError, notFound, toErrorBody } from '../http/errors.js';
import type { ComputePool } from './pool.js';

export type JobState = 'queued' | 'running' | 'succeeded' | 'failed' | 'cancelled';

/** What GET /api/compute/solve-jobs/:id shows. */
export interface JobView {
  id: string;
  state: JobState;
  progress: { fraction: number; message: string };
  result?: unknown;
  /** As the direct call would have answered. */
  error?: { code: string; message: string; details?: unknown; status: number };
  createdAt: Date;
  finishedAt?: Date;
}

interface Job extends JobView {
  ownerId: string;
  abort: AbortController;
}

export class SolveJobs {
  private readonly jobs = new Map<string, Job>();
  private readonly sweeper: NodeJS.Timeout;

  constructor(
    private readonly pool: ComputePool,
    private readonly o: { timeLimitMs: number; maxActivePerUser?: number; retainMs?: number },
  ) {
    this.sweeper = setInterval(() => this.forgetOld(), 60_000);
    this.sweeper.unref();
  }

  start(ownerId: string, input: unknown): JobView {
    const active = [...this.jobs.values()].filter((j) => j.ownerId === ownerId && (j.state === 'queued' || j.state === 'running'));
    if (active.length >= (this.o.maxActivePerUser ?? 3)) {
      throw new HttpError(429, 'too_many_jobs', 'You already have several solves running; wait for one to finish or cancel it');
    }
    const job: Job = {
      id: randomUUID(),
      ownerId,
      state: 'queued',
      progress: { fraction: 0, message: 'Waiting for a free worker' },
      createdAt: new Date(),
      abort: new AbortController(),
    };
    this.jobs.set(job.id, job);
    this.pool
      .run('solve', input, {
        timeLimitMs: this.o.timeLimitMs,
        signal: job.abort.signal,
        onProgress: (m) => {
          if (job.state === 'queued') job.state = 'running';
          if (m.type === 'progress') job.progress = { fraction: Math.min(1, Math.max(0, m.fraction)), message: m.message };
          else job.progress = { fraction: 0, message: 'Started' };
        },
      })
      .then(
        (result) => {
          job.state = 'succeeded';
          job.result = result;
          job.progress = { fraction: 1, message: 'Done' };
        },
        (err: unknown) => {
          if (job.state === 'cancelled') return;
          const b = toErrorBody(err);
          job.state = 'failed';
          job.error = { status: b.status, code: b.code, message: b.message, ...(b.details !== undefined ? { details: b.details } : {}) };
        },
      )
      .finally(() => {
        job.finishedAt = new Date();
      });
    return this.view(job);
  }

  get(ownerId: string, id: string): JobView {
    return this.view(this.owned(ownerId, id));
  }

  cancel(ownerId: string, id: string): JobView {
    const job = this.owned(ownerId, id);
    if (job.state === 'queued' || job.state === 'running') {
      job.state = 'cancelled';
      job.progress = { ...job.progress, message: 'Cancelled' };
      job.abort.abort();
    }
    return this.view(job);
  }

  close(): void {
    clearInterval(this.sweeper);
    for (const j of this.jobs.values()) j.abort.abort();
    this.jobs.clear();
  }

  private owned(ownerId: string, id: string): Job {
    const job = this.jobs.get(id);
    // Someone else's job is as invisible as a missing one.
    if (!job || job.ownerId !== ownerId) throw notFound('Solve job');
    return job;
  }

  private view(j: Job): JobView {
    const v: JobView = { id: j.id, state: j.state, progress: j.progress, createdAt: j.createdAt };
    if (j.result !== undefined) v.result = j.result;
    if (j.error) v.error = j.error;
    if (j.finishedAt) v.finishedAt = j.finishedAt;
    return v;
  }

  private forgetOld(): void {
    const limit = Date.now() - (this.o.retainMs ?? 15 * 60_000);
    for (const [id, j] of this.jobs) if (j.finishedAt && j.finishedAt.getTime() < limit) this.jobs.delete(id);
  }
}

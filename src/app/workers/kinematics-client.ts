import { Injectable, OnDestroy } from '@angular/core';
import type { AnalysisFailure, AnalysisRequest, CornerAnalysis, WorkerReply } from './analysis-types';

/** Thrown (rejected) when the engine refuses or cannot solve a corner. */
export class AnalysisError extends Error {
  constructor(readonly failure: AnalysisFailure) {
    super(failure.message);
    this.name = 'AnalysisError';
  }
}

/** Thrown when a newer request replaced this one before it ran. */
export class AnalysisSuperseded extends Error {
  constructor() {
    super('A newer edit replaced this request.');
    this.name = 'AnalysisSuperseded';
  }
}

interface Pending {
  readonly id: number;
  readonly request: AnalysisRequest;
  readonly resolve: (a: CornerAnalysis) => void;
  readonly reject: (e: unknown) => void;
}

/**
 * Runs corner analyses in a Web Worker (the shared/ engine, loaded with the
 * worker's own chunk). At most one request runs; while it runs, only the
 * newest waiting request is kept, so a burst of edits solves the last one.
 * Where the browser offers no Worker (unit tests under jsdom), the same
 * engine code runs on the main thread, loaded lazily.
 */
@Injectable()
export class KinematicsClient implements OnDestroy {
  private worker: Worker | null = null;
  private nextId = 1;
  private running: Pending | null = null;
  private waiting: Pending | null = null;

  analyse(request: AnalysisRequest): Promise<CornerAnalysis> {
    return new Promise<CornerAnalysis>((resolve, reject) => {
      const job: Pending = { id: this.nextId++, request, resolve, reject };
      if (this.waiting) this.waiting.reject(new AnalysisSuperseded());
      this.waiting = job;
      this.pump();
    });
  }

  ngOnDestroy(): void {
    this.worker?.terminate();
    this.worker = null;
    this.waiting?.reject(new AnalysisSuperseded());
    this.running?.reject(new AnalysisSuperseded());
    this.waiting = this.running = null;
  }

  private pump(): void {
    if (this.running || !this.waiting) return;
    const job = this.waiting;
    this.waiting = null;
    this.running = job;
    if (typeof Worker === 'undefined') {
      void this.runInPage(job);
      return;
    }
    this.ensureWorker().postMessage({ id: job.id, request: job.request });
  }

  private ensureWorker(): Worker {
    if (!this.worker) {
      this.worker = new Worker(new URL('./kinematics.worker', import.meta.url), { type: 'module', name: 'rollwise-kinematics' });
      this.worker.addEventListener('message', (e: MessageEvent<WorkerReply>) => this.finish(e.data));
      this.worker.addEventListener('error', (e: ErrorEvent) => {
        const job = this.running;
        this.running = null;
        job?.reject(new AnalysisError({ code: 'worker_failed', message: `The kinematics worker failed: ${e.message || 'unknown error'}` }));
        this.worker?.terminate();
        this.worker = null;
        this.pump();
      });
    }
    return this.worker;
  }

  private async runInPage(job: Pending): Promise<void> {
    let reply: WorkerReply;
    try {
      const [engine, { describeFailure }] = await Promise.all([import('./corner-analysis'), import('./describe-failure')]);
      try {
        reply = { id: job.id, ok: true, analysis: engine.analyseCorner(job.request) };
      } catch (error) {
        reply = { id: job.id, ok: false, failure: describeFailure(error) };
      }
    } catch (error) {
      reply = { id: job.id, ok: false, failure: { code: 'engine_load_failed', message: String(error) } };
    }
    this.finish(reply);
  }

  private finish(reply: WorkerReply): void {
    const job = this.running;
    if (!job || job.id !== reply.id) return;
    this.running = null;
    if (reply.ok) job.resolve(reply.analysis);
    else job.reject(new AnalysisError(reply.failure));
    this.pump();
  }
}

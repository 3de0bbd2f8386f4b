import { Injectable, OnDestroy } from '@angular/core';
import { AnalysisError, AnalysisSuperseded } from '../../workers/kinematics-client';
import type { CurvesReply, CurvesRequest, PosesReply, PosesRequest, ViewsReply, ViewsRequest, ViewsWorkerAnswer } from './views-types';

interface Pending {
  readonly id: number;
  readonly resolve: (r: ViewsReply) => void;
  readonly reject: (e: unknown) => void;
}

/**
 * Runs the linkage views' requests in their own Web Worker. A newer request
 * of the same kind supersedes a waiting one (its promise rejects with
 * AnalysisSuperseded). Without Worker (unit tests under jsdom) the same
 * engine runs in the page, loaded lazily.
 */
@Injectable()
export class ViewsClient implements OnDestroy {
  private worker: Worker | null = null;
  private nextId = 1;
  private readonly pending = new Map<number, Pending>();
  private readonly latest = new Map<ViewsRequest['kind'], number>();

  curves(request: Omit<CurvesRequest, 'kind'>): Promise<CurvesReply> {
    return this.run({ kind: 'curves', ...request }) as Promise<CurvesReply>;
  }

  poses(request: Omit<PosesRequest, 'kind'>): Promise<PosesReply> {
    return this.run({ kind: 'poses', ...request }) as Promise<PosesReply>;
  }

  ngOnDestroy(): void {
    this.worker?.terminate();
    this.worker = null;
    for (const p of this.pending.values()) p.reject(new AnalysisSuperseded());
    this.pending.clear();
  }

  private run(request: ViewsRequest): Promise<ViewsReply> {
    const id = this.nextId++;
    const before = this.latest.get(request.kind);
    if (before !== undefined) {
      this.pending.get(before)?.reject(new AnalysisSuperseded());
      this.pending.delete(before);
    }
    this.latest.set(request.kind, id);
    return new Promise<ViewsReply>((resolve, reject) => {
      this.pending.set(id, { id, resolve, reject });
      if (typeof Worker === 'undefined') void this.runInPage(id, request);
      else this.ensureWorker().postMessage({ id, request });
    });
  }

  private ensureWorker(): Worker {
    if (!this.worker) {
      this.worker = new Worker(new URL('./views.worker', import.meta.url), { type: 'module', name: 'rollwise-views' });
      this.worker.addEventListener('message', (e: MessageEvent<ViewsWorkerAnswer>) => this.finish(e.data));
      this.worker.addEventListener('error', (e: ErrorEvent) => {
        const failure = { code: 'worker_failed', message: `The views worker failed: ${e.message || 'unknown error'}` };
        for (const p of this.pending.values()) p.reject(new AnalysisError(failure));
        this.pending.clear();
        this.worker?.terminate();
        this.worker = null;
      });
    }
    return this.worker;
  }

  private async runInPage(id: number, request: ViewsRequest): Promise<void> {
    let answer: ViewsWorkerAnswer;
    try {
      const engine = await import('./views-engine');
      try {
        answer = { id, ok: true, reply: engine.runViewsRequest(request) };
      } catch (error) {
        answer = { id, ok: false, failure: engine.describeFailure(error) };
      }
    } catch (error) {
      answer = { id, ok: false, failure: { code: 'engine_load_failed', message: String(error) } };
    }
    this.finish(answer);
  }

  private finish(answer: ViewsWorkerAnswer): void {
    const job = this.pending.get(answer.id);
    if (!job) return;
    this.pending.delete(answer.id);
    if (answer.ok) job.resolve(answer.reply);
    else job.reject(new AnalysisError(answer.failure));
  }
}

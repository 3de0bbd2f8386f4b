import { Injectable, OnDestroy } from '@angular/core';
import type { SolveResult } from '../../../shared/intent/index';
import type { IntentWorkerReply } from './intent-types';
import { AnalysisError } from './kinematics-client';

/**
 * Runs the intent back-solver in a Web Worker with progress reports. One
 * solve at a time; `cancel()` ends the worker (and with it the solve).
 * Without Worker support (unit tests) the solver runs in the page.
 */
@Injectable()
export class IntentClient implements OnDestroy {
  private worker: Worker | null = null;
  private nextId = 1;
  private reject: ((e: unknown) => void) | null = null;

  solve(intent: unknown, onProgress: (fraction: number, message: string) => void): Promise<SolveResult> {
    this.cancel();
    const id = this.nextId++;
    if (typeof Worker === 'undefined') return this.solveInPage(intent, onProgress);
    return new Promise<SolveResult>((resolve, reject) => {
      this.reject = reject;
      const worker = new Worker(new URL('./intent.worker', import.meta.url), { type: 'module', name: 'rollwise-intent' });
      this.worker = worker;
      worker.addEventListener('message', (e: MessageEvent<IntentWorkerReply>) => {
        const r = e.data;
        if (r.id !== id) return;
        if (r.kind === 'progress') onProgress(r.fraction, r.message);
        else {
          this.reject = null;
          this.stopWorker();
          if (r.kind === 'done') resolve(r.result);
          else reject(new AnalysisError(r.failure));
        }
      });
      worker.addEventListener('error', (e: ErrorEvent) => {
        this.reject = null;
        this.stopWorker();
        reject(new AnalysisError({ code: 'worker_failed', message: `The solver worker failed: ${e.message || 'unknown error'}` }));
      });
      worker.postMessage({ id, intent });
    });
  }

  /** Stops a running solve; its promise rejects with a "cancelled" failure. */
  cancel(): void {
    if (this.reject) this.reject(new AnalysisError({ code: 'cancelled', message: 'The solve was cancelled.' }));
    this.reject = null;
    this.stopWorker();
  }

  ngOnDestroy(): void {
    this.cancel();
  }

  private stopWorker(): void {
    this.worker?.terminate();
    this.worker = null;
  }

  private async solveInPage(intent: unknown, onProgress: (f: number, m: string) => void): Promise<SolveResult> {
    const [{ computeSolve }, { describeFailure }] = await Promise.all([import('../../../shared/intent/api'), import('./corner-analysis')]);
    try {
      return computeSolve(intent, onProgress);
    } catch (error) {
      throw new AnalysisError(describeFailure(error));
    }
  }
}

import { Injectable, OnDestroy } from '@angular/core';
import type { ProposalDetails, SolveResult } from '../../../shared/intent/index';
import { parseOrThrow } from '../../../shared/errors';
import { intentSchema, type Intent } from '../../../shared/schema/intent';
import type { IntentWorkerReply } from './intent-types';
import { describeFailure } from './describe-failure';
import { AnalysisError, AnalysisSuperseded } from './kinematics-client';
import type { DisplayUnits } from '../core/api-types';
import { figureUnits, type FigureUnits } from '../../../shared/cautions/figures';

/** One worker and the promise it answers. */
interface Run {
  worker: Worker | null;
  reject: ((e: unknown) => void) | null;
}

/**
 * Runs the intent back-solver in a Web Worker with progress reports, and works
 * out a chosen family member in a second one (so choosing a member never stops
 * a solve). One of each at a time: `cancel()` ends the solve; a new member
 * request supersedes the one before. The intent is validated here, in the page,
 * before it is posted (a refused one rejects with the schema's field issues and
 * starts no worker), so the worker carries no intent or vehicle schema
 * (docs/bundles.md). Without Worker support (unit tests) the engine runs in the page,
 * through the validating entry points the server and the CLI use.
 */
@Injectable()
export class IntentClient implements OnDestroy {
  private nextId = 1;
  private readonly solveRun: Run = { worker: null, reject: null };
  private readonly memberRun: Run = { worker: null, reject: null };

  solve(intent: unknown, onProgress: (fraction: number, message: string) => void, units: DisplayUnits = 'si'): Promise<SolveResult> {
    this.cancel();
    const parsed = validated(intent);
    if (!parsed.ok) return Promise.reject(parsed.error);
    if (typeof Worker === 'undefined') return this.inPage(async () => (await import('../../../shared/intent/api')).computeSolve(parsed.intent, onProgress, (await import('../../../shared/cautions/figures')).cautionFigures(figureUnits(units))));
    return this.start(this.solveRun, { intent: parsed.intent, figures: figureUnits(units) }, onProgress).then((r) => {
      if (r.kind !== 'done') throw new AnalysisError({ code: 'engine_error', message: 'The solver answered with something else.' });
      return r.result;
    });
  }

  /** The family member at `member` (movable coordinates by name, mm) worked out for the workshop, its cautions worded in `units`. */
  details(intent: unknown, member: Readonly<Record<string, number>>, units: DisplayUnits = 'si'): Promise<ProposalDetails> {
    this.stop(this.memberRun, new AnalysisSuperseded());
    const parsed = validated(intent);
    if (!parsed.ok) return Promise.reject(parsed.error);
    if (typeof Worker === 'undefined') return this.inPage(async () => (await import('../../../shared/intent/api')).computeProposalDetails(parsed.intent, member, (await import('../../../shared/cautions/figures')).cautionFigures(figureUnits(units))));
    return this.start(this.memberRun, { intent: parsed.intent, member, figures: figureUnits(units) }, () => undefined).then((r) => {
      if (r.kind !== 'details') throw new AnalysisError({ code: 'engine_error', message: 'The solver answered with something else.' });
      return r.details;
    });
  }

  /** Stops a running solve; its promise rejects with a "cancelled" failure. */
  cancel(): void {
    this.stop(this.solveRun, new AnalysisError({ code: 'cancelled', message: 'The solve was cancelled.' }));
  }

  ngOnDestroy(): void {
    this.cancel();
    this.stop(this.memberRun, new AnalysisSuperseded());
  }

  private start(run: Run, message: { intent: Intent; member?: Readonly<Record<string, number>>; figures: FigureUnits }, onProgress: (f: number, m: string) => void) {
    const id = this.nextId++;
    return new Promise<Exclude<IntentWorkerReply, { kind: 'progress' | 'failed' }>>((resolve, reject) => {
      run.reject = reject;
      const worker = new Worker(new URL('./intent.worker', import.meta.url), { type: 'module', name: 'rollwise-intent' });
      run.worker = worker;
      worker.addEventListener('message', (e: MessageEvent<IntentWorkerReply>) => {
        const r = e.data;
        if (r.id !== id) return;
        if (r.kind === 'progress') onProgress(r.fraction, r.message);
        else {
          run.reject = null;
          this.stop(run, null);
          if (r.kind === 'failed') reject(new AnalysisError(r.failure));
          else resolve(r);
        }
      });
      worker.addEventListener('error', (e: ErrorEvent) => {
        run.reject = null;
        this.stop(run, null);
        reject(new AnalysisError({ code: 'worker_failed', message: `The solver worker failed: ${e.message || 'unknown error'}` }));
      });
      worker.postMessage({ id, ...message });
    });
  }

  /** Ends the run's worker; a waiting promise rejects with `why`. */
  private stop(run: Run, why: unknown): void {
    if (run.reject && why !== null) run.reject(why);
    run.reject = null;
    run.worker?.terminate();
    run.worker = null;
  }

  private async inPage<T>(work: () => Promise<T>): Promise<T> {
    try {
      return await work();
    } catch (error) {
      throw new AnalysisError(describeFailure(error));
    }
  }
}

/** The intent document parsed by `intentSchema`, or the refusal as the worker would have answered it (InputError's field issues). */
function validated(intent: unknown): { ok: true; intent: Intent } | { ok: false; error: AnalysisError } {
  try {
    return { ok: true, intent: parseOrThrow(intentSchema, intent, 'intent') };
  } catch (error) {
    return { ok: false, error: new AnalysisError(describeFailure(error)) };
  }
}

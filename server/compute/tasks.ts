/** What crosses the worker boundary: task kinds, and errors as plain data (class identity does not survive structured clone). */
import { InputError, SolveError, type FieldIssue, type SolveErrorCode } from '../../shared/errors.js';

export const COMPUTE_KINDS = ['corner-sweep', 'axle-roll', 'corner-compliance', 'balance', 'ride', 'solve', 'rig-compare'] as const;
export type ComputeKind = (typeof COMPUTE_KINDS)[number];
/**
 * Also run on worker threads, by queue workers only (no /api/compute route): one study chunk, a study's
 * combination, and the warm-up a worker runs on each study thread at start (a small built-in study).
 */
export const STUDY_KINDS = ['study-chunk', 'study-combine', 'study-warm'] as const;
/**
 * Run for the API's own services (no /api/compute route): both corners' cautions of a configuration (the
 * review gates), and a submitted study's plan, which builds and checks its model (up to some 40 ms: off the
 * event loop, so a class submitting at once does not hold up everyone's reads).
 */
export const SERVICE_KINDS = ['configuration-cautions', 'study-plan'] as const;
export type TaskKind = ComputeKind | (typeof STUDY_KINDS)[number] | (typeof SERVICE_KINDS)[number];

export interface ComputeTask {
  kind: TaskKind;
  input: unknown;
  /** Receives `ProgressMessage`s (solve only). */
  progressPort?: import('node:worker_threads').MessagePort;
  /**
   * Return the result as JSON text (`json`) instead of an object: the worker
   * pays for JSON.stringify, and the main thread copies one string instead of
   * rebuilding a large object graph and stringifying it again.
   */
  asJson?: boolean;
}

export type ProgressMessage = { type: 'started' } | { type: 'progress'; fraction: number; message: string };

export type SerializedError =
  | { kind: 'input'; message: string; issues: FieldIssue[] }
  | { kind: 'solve'; code: SolveErrorCode; message: string; details: Record<string, unknown> }
  | { kind: 'internal'; message: string };

export type WorkerOutcome = { ok: true; result: unknown } | { ok: true; json: string } | { ok: false; error: SerializedError };

export function serializeError(err: unknown): SerializedError {
  if (err instanceof InputError) return { kind: 'input', message: err.message, issues: err.issues };
  if (err instanceof SolveError) return { kind: 'solve', code: err.code, message: err.message, details: err.details };
  return { kind: 'internal', message: err instanceof Error ? err.message : String(err) };
}

export function deserializeError(e: SerializedError): Error {
  if (e.kind === 'input') return new InputError(e.message, e.issues);
  if (e.kind === 'solve') return new SolveError(e.code, e.message, e.details);
  return new Error(`compute worker failed: ${e.message}`);
}

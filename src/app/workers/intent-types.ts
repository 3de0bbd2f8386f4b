import type { SolveResult } from '../../../shared/intent/index';
import type { AnalysisFailure } from './analysis-types';

export type IntentWorkerRequest = { readonly id: number; readonly intent: unknown };
export type IntentWorkerReply =
  | { readonly id: number; readonly kind: 'progress'; readonly fraction: number; readonly message: string }
  | { readonly id: number; readonly kind: 'done'; readonly result: SolveResult }
  | { readonly id: number; readonly kind: 'failed'; readonly failure: AnalysisFailure };

import type { ProposalDetails, SolveResult } from '../../../shared/intent/index';
import type { AnalysisFailure } from './analysis-types';
import type { FigureUnits } from '../../../shared/cautions/figures';
import type { Intent } from '../../../shared/schema/intent';

/**
 * A solve of the intent, or (with `member`) one family member worked out for the workshop; `figures` are the units of the
 * cautions' words. The intent is the page's parse of the document with `intentSchema` (the worker does not validate).
 */
export type IntentWorkerRequest = { readonly id: number; readonly intent: Intent; readonly member?: Readonly<Record<string, number>>; readonly figures: FigureUnits };
export type IntentWorkerReply =
  | { readonly id: number; readonly kind: 'progress'; readonly fraction: number; readonly message: string }
  | { readonly id: number; readonly kind: 'done'; readonly result: SolveResult }
  | { readonly id: number; readonly kind: 'details'; readonly details: ProposalDetails }
  | { readonly id: number; readonly kind: 'failed'; readonly failure: AnalysisFailure };

/**
 * JSON entry point of the back-solver for the HTTP worker and the CLI:
 * validates with `intentSchema` (InputError naming every field), solves, and
 * returns a JSON-safe plain object (no NaN, no undefined). `figures` writes
 * the cautions' figures in the user's units (SI without).
 */
import { parseOrThrow } from '../errors.js';
import { intentSchema } from '../schema/intent.js';
import { solveIntent, type Progress, type SolveResult } from './solve.js';
import { proposalDetails, type ProposalDetails } from './member.js';
import type { CautionFigures } from '../cautions/cautions.js';

export function computeSolve(input: unknown, onProgress?: Progress, figures?: CautionFigures): SolveResult {
  const intent = parseOrThrow(intentSchema, input, 'intent');
  return jsonSafe(solveIntent(intent, onProgress, figures));
}

/** One chosen member of the family (coordinate values by name, mm) worked out for the workshop; validates the intent first. */
export function computeProposalDetails(input: unknown, values: Readonly<Record<string, number>>, figures?: CautionFigures): ProposalDetails {
  const intent = parseOrThrow(intentSchema, input, 'intent');
  return jsonSafe(proposalDetails(intent, values, figures));
}

/** Replaces non-finite numbers by null so the result survives JSON unchanged. */
function jsonSafe<T>(value: T): T {
  return JSON.parse(JSON.stringify(value, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v))) as T;
}

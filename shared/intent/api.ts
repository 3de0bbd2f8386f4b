/**
 * JSON entry point of the back-solver for the HTTP worker and the CLI:
 * validates with `intentSchema` (InputError naming every field), solves, and
 * returns a JSON-safe plain object (no NaN, no undefined). `figures` writes
 * the cautions' figures in the user's units (SI without).
 */
import { parseOrThrow } from '../errors.js';
import { intentSchema } from '../schema/intent.js';
import type { Progress, SolveResult } from './solve.js';
import type { ProposalDetails } from './member.js';
import type { CautionFigures } from '../cautions/cautions.js';
import { proposalDetailsJson, solveIntentJson } from './json.js';

export function computeSolve(input: unknown, onProgress?: Progress, figures?: CautionFigures): SolveResult {
  return solveIntentJson(parseOrThrow(intentSchema, input, 'intent'), onProgress, figures);
}

/** One chosen member of the family (coordinate values by name, mm) worked out for the workshop; validates the intent first. */
export function computeProposalDetails(input: unknown, values: Readonly<Record<string, number>>, figures?: CautionFigures): ProposalDetails {
  return proposalDetailsJson(parseOrThrow(intentSchema, input, 'intent'), values, figures);
}

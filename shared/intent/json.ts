/**
 * The back-solver's JSON-safe results for an intent already validated by
 * `intentSchema` (no NaN, no undefined): what the browser's intent worker
 * runs, the page having validated the intent before posting it, so the
 * worker carries no intent or vehicle schema. `computeSolve` /
 * `computeProposalDetails` (api.ts) validate first and call these.
 */
import type { Intent } from '../schema/intent.js';
import type { CautionFigures } from '../cautions/cautions.js';
import { solveIntent, type Progress, type SolveResult } from './solve.js';
import { proposalDetails, type ProposalDetails } from './member.js';

/** Solves a validated intent; `figures` writes the cautions' figures in the user's units (SI without). */
export function solveIntentJson(intent: Intent, onProgress?: Progress, figures?: CautionFigures): SolveResult {
  return jsonSafe(solveIntent(intent, onProgress, figures));
}

/** One chosen member of a validated intent's family (coordinate values by name, mm) worked out for the workshop. */
export function proposalDetailsJson(intent: Intent, values: Readonly<Record<string, number>>, figures?: CautionFigures): ProposalDetails {
  return jsonSafe(proposalDetails(intent, values, figures));
}

/** Replaces non-finite numbers by null so the result survives JSON unchanged. */
function jsonSafe<T>(value: T): T {
  return JSON.parse(JSON.stringify(value, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v))) as T;
}

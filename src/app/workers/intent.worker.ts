/**
 * Web Worker running the back-solver of shared/intent (solveIntent through
 * its validating entry point computeSolve), reporting progress as it goes;
 * with a `member` it works out that family member (computeProposalDetails).
 * Cautions are worded in the units the page sends (`figures`).
 */
import { computeProposalDetails, computeSolve } from '../../../shared/intent/api';
import { describeFailure } from './corner-analysis';
import type { IntentWorkerReply, IntentWorkerRequest } from './intent-types';
import { cautionFigures } from './caution-figures';

addEventListener('message', (event: MessageEvent<IntentWorkerRequest>) => {
  const { id, intent, member } = event.data;
  const figures = cautionFigures(event.data.figures);
  let reply: IntentWorkerReply;
  try {
    if (member) reply = { id, kind: 'details', details: computeProposalDetails(intent, member, figures) };
    else {
      const result = computeSolve(intent, (fraction, message) => postMessage({ id, kind: 'progress', fraction, message } satisfies IntentWorkerReply), figures);
      reply = { id, kind: 'done', result };
    }
  } catch (error) {
    reply = { id, kind: 'failed', failure: describeFailure(error) };
  }
  postMessage(reply);
});

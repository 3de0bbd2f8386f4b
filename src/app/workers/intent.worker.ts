/**
 * Web Worker running the back-solver of shared/intent (solveIntent through
 * its validating entry point computeSolve), reporting progress as it goes;
 * with a `member` it works out that family member (computeProposalDetails).
 */
import { computeProposalDetails, computeSolve } from '../../../shared/intent/api';
import { describeFailure } from './corner-analysis';
import type { IntentWorkerReply, IntentWorkerRequest } from './intent-types';

addEventListener('message', (event: MessageEvent<IntentWorkerRequest>) => {
  const { id, intent, member } = event.data;
  let reply: IntentWorkerReply;
  try {
    if (member) reply = { id, kind: 'details', details: computeProposalDetails(intent, member) };
    else {
      const result = computeSolve(intent, (fraction, message) => postMessage({ id, kind: 'progress', fraction, message } satisfies IntentWorkerReply));
      reply = { id, kind: 'done', result };
    }
  } catch (error) {
    reply = { id, kind: 'failed', failure: describeFailure(error) };
  }
  postMessage(reply);
});

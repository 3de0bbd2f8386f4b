/**
 * Web Worker running the back-solver of shared/intent (solveIntent through
 * its validating entry point computeSolve), reporting progress as it goes.
 */
import { computeSolve } from '../../../shared/intent/api';
import { describeFailure } from './corner-analysis';
import type { IntentWorkerReply, IntentWorkerRequest } from './intent-types';

addEventListener('message', (event: MessageEvent<IntentWorkerRequest>) => {
  const { id, intent } = event.data;
  let reply: IntentWorkerReply;
  try {
    const result = computeSolve(intent, (fraction, message) => postMessage({ id, kind: 'progress', fraction, message } satisfies IntentWorkerReply));
    reply = { id, kind: 'done', result };
  } catch (error) {
    reply = { id, kind: 'failed', failure: describeFailure(error) };
  }
  postMessage(reply);
});

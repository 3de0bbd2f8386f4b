/**
 * Web Worker running the back-solver of shared/intent (solveIntent through
 * solveIntentJson), reporting progress as it goes; with a `member` it works
 * out that family member (proposalDetailsJson). The intent arrives validated:
 * IntentClient parses it with `intentSchema` in the page before posting, so
 * this worker carries neither the intent nor the vehicle schema
 * (docs/bundles.md). Cautions are worded in the units the page sends (`figures`).
 */
import { proposalDetailsJson, solveIntentJson } from '../../../shared/intent/json';
import { describeFailure } from './describe-failure';
import type { IntentWorkerReply, IntentWorkerRequest } from './intent-types';
import { cautionFigures } from '../../../shared/cautions/figures';

addEventListener('message', (event: MessageEvent<IntentWorkerRequest>) => {
  const { id, intent, member } = event.data;
  const figures = cautionFigures(event.data.figures);
  let reply: IntentWorkerReply;
  try {
    if (member) reply = { id, kind: 'details', details: proposalDetailsJson(intent, member, figures) };
    else {
      const result = solveIntentJson(intent, (fraction, message) => postMessage({ id, kind: 'progress', fraction, message } satisfies IntentWorkerReply), figures);
      reply = { id, kind: 'done', result };
    }
  } catch (error) {
    reply = { id, kind: 'failed', failure: describeFailure(error) };
  }
  postMessage(reply);
});

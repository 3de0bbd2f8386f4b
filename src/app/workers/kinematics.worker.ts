/**
 * Web Worker running the kinematics engine of shared/ off the main thread,
 * so editing a hardpoint never stalls the page. One message in, one reply
 * out; the client keeps only the latest request.
 */
import { analyseCorner } from './corner-analysis';
import { describeFailure } from './describe-failure';
import type { WorkerReply, WorkerRequest } from './analysis-types';

addEventListener('message', (event: MessageEvent<WorkerRequest>) => {
  const { id, request } = event.data;
  let reply: WorkerReply;
  try {
    reply = { id, ok: true, analysis: analyseCorner(request) };
  } catch (error) {
    reply = { id, ok: false, failure: describeFailure(error) };
  }
  postMessage(reply);
});

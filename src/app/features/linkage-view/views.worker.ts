/**
 * Web Worker for the linkage views (output curves, 3D sweep poses): the
 * shared/ engine off the main thread, loaded only when a view asks for it.
 */
import { describeFailure, runViewsRequest } from './views-engine';
import type { ViewsWorkerAnswer, ViewsWorkerMessage } from './views-types';

addEventListener('message', (event: MessageEvent<ViewsWorkerMessage>) => {
  const { id, request } = event.data;
  let answer: ViewsWorkerAnswer;
  try {
    answer = { id, ok: true, reply: runViewsRequest(request) };
  } catch (error) {
    answer = { id, ok: false, failure: describeFailure(error) };
  }
  postMessage(answer);
});

/** Which handler runs each queue's jobs in a worker (server/compute/runner.ts). */
import { QUEUES } from './queue.js';
import { lostHandler, solveHandler, type QueueHandler } from './runner.js';
import { studyChunkHandler, studyCombineHandler } from './study-handlers.js';

export const queueHandlers: Partial<Record<string, QueueHandler>> = {
  [QUEUES.solve]: solveHandler,
  [QUEUES.lost]: lostHandler,
  [QUEUES.studyChunk]: studyChunkHandler,
  [QUEUES.studyCombine]: studyCombineHandler,
};

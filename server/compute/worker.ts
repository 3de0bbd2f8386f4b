/**
 * Piscina worker: runs one engine call from shared/ off the main event loop.
 * Each engine entry point validates its own input with the shared request
 * schemas and throws InputError / SolveError; those are returned as data.
 */
import type { ComputeTask, ProgressMessage, TaskKind, WorkerOutcome } from './tasks.js';
import { serializeError } from './tasks.js';
import { computeAxleRoll, computeCornerSweep } from '../../shared/kinematics/api.js';
import { computeBalance } from '../../shared/balance/api.js';
import { computeCornerCompliance } from '../../shared/compliance/api.js';
import { computeRide } from '../../shared/ride/api.js';
import { computeSolve } from '../../shared/intent/api.js';
import { computeRigComparison } from '../../shared/intent/rig-compare.js';
import { combineStudyChunks, runStudyChunk, type StudyChunkResult } from '../../shared/study/index.js';

type Engine = (input: unknown, onProgress?: (fraction: number, message: string) => void) => unknown;

/**
 * A study's spec, parsed once per thread: every chunk of a study carries the
 * same spec (keyed by study id), and shared/study caches its prepared model
 * by the spec object, so the thread keeps the first copy it was given.
 */
const specs = new Map<string, unknown>();
function studySpec(studyId: string, spec: unknown): unknown {
  let s = specs.get(studyId);
  if (s === undefined) {
    if (specs.size >= 8) specs.delete(specs.keys().next().value!);
    specs.set(studyId, (s = spec));
  }
  return s;
}

const ENGINES: Record<TaskKind, Engine> = {
  'corner-sweep': computeCornerSweep,
  'axle-roll': computeAxleRoll,
  'corner-compliance': computeCornerCompliance,
  balance: computeBalance,
  ride: computeRide,
  solve: computeSolve,
  'rig-compare': computeRigComparison,
  'study-chunk': (input) => {
    const i = input as { studyId: string; spec: unknown; chunkIndex: number };
    return runStudyChunk(studySpec(i.studyId, i.spec), i.chunkIndex);
  },
  'study-combine': (input) => {
    const i = input as { studyId: string; spec: unknown; chunks: StudyChunkResult[] };
    return combineStudyChunks(studySpec(i.studyId, i.spec), i.chunks);
  },
};

export default async function runComputeTask(task: ComputeTask): Promise<WorkerOutcome> {
  const port = task.progressPort;
  try {
    const fn = ENGINES[task.kind];
    port?.postMessage({ type: 'started' } satisfies ProgressMessage);
    const onProgress = port
      ? (fraction: number, message: string) => port.postMessage({ type: 'progress', fraction, message } satisfies ProgressMessage)
      : undefined;
    const result = await fn(task.input, onProgress);
    return task.asJson ? { ok: true, json: JSON.stringify(result) } : { ok: true, result };
  } catch (err) {
    return { ok: false, error: serializeError(err) };
  } finally {
    port?.close();
  }
}

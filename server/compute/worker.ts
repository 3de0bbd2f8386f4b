/**
 * Piscina worker: runs one engine call from shared/ off the main event loop.
 * Each engine entry point validates its own input with the shared request
 * schemas and throws InputError / SolveError; those are returned as data.
 */
import type { ComputeKind, ComputeTask, ProgressMessage, WorkerOutcome } from './tasks.js';
import { serializeError } from './tasks.js';
import { computeAxleRoll, computeCornerSweep } from '../../shared/kinematics/api.js';
import { computeBalance } from '../../shared/balance/api.js';
import { computeCornerCompliance } from '../../shared/compliance/api.js';
import { computeRide } from '../../shared/ride/api.js';
import { computeSolve } from '../../shared/intent/api.js';
import { computeRigComparison } from '../../shared/intent/rig-compare.js';

type Engine = (input: unknown, onProgress?: (fraction: number, message: string) => void) => unknown;

const ENGINES: Record<ComputeKind, Engine> = {
  'corner-sweep': computeCornerSweep,
  'axle-roll': computeAxleRoll,
  'corner-compliance': computeCornerCompliance,
  balance: computeBalance,
  ride: computeRide,
  solve: computeSolve,
  'rig-compare': computeRigComparison,
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

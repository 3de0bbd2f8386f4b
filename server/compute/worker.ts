/**
 * Piscina worker: runs one engine call from shared/ off the main event loop.
 * Each engine entry point validates its own input with the shared request
 * schemas and throws InputError / SolveError; those are returned as data.
 */
import type { ComputeKind, ComputeTask, ProgressMessage, WorkerOutcome } from './tasks.js';
import { serializeError } from './tasks.js';

type Engine = (input: unknown, onProgress?: (fraction: number, message: string) => void) => unknown;

// Where each engine lives (module, export). Loaded on first use per worker.
const ENGINES: Record<ComputeKind, [string, string]> = {
  'corner-sweep': ['../../shared/kinematics/api.js', 'computeCornerSweep'],
  'axle-roll': ['../../shared/kinematics/api.js', 'computeAxleRoll'],
  balance: ['../../shared/balance/api.js', 'computeBalance'],
  solve: ['../../shared/intent/api.js', 'computeSolve'],
};

const loaded = new Map<ComputeKind, Engine>();

async function engine(kind: ComputeKind): Promise<Engine> {
  const have = loaded.get(kind);
  if (have) return have;
  const [specifier, name] = ENGINES[kind];
  const mod = (await import(specifier)) as Record<string, unknown>;
  const fn = mod[name];
  if (typeof fn !== 'function') throw new Error(`${specifier} does not export ${name}`);
  loaded.set(kind, fn as Engine);
  return fn as Engine;
}

export default async function runComputeTask(task: ComputeTask): Promise<WorkerOutcome> {
  const port = task.progressPort;
  try {
    const fn = await engine(task.kind);
    port?.postMessage({ type: 'started' } satisfies ProgressMessage);
    const onProgress = port
      ? (fraction: number, message: string) => port.postMessage({ type: 'progress', fraction, message } satisfies ProgressMessage)
      : undefined;
    const result = await fn(task.input, onProgress);
    return { ok: true, result };
  } catch (err) {
    return { ok: false, error: serializeError(err) };
  } finally {
    port?.close();
  }
}

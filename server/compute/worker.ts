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
import { computeRigComparison } from '../../shared/rig/compare.js';
import { computeConfigurationCautions } from '../../shared/cautions/configuration-cautions.js';
import { chunkFromWire, chunkToWire, combineStudyChunks, planStudy, runStudyChunk, withFactorLabels, type StudySpec } from '../../shared/study/index.js';
import { exampleCorners } from '../../shared/kinematics/index.js';
import { exampleVehicles } from '../../shared/balance/index.js';
import type { ComputedChunk } from './study-handlers.js';

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

/**
 * The warm-up a queue worker runs once on each study thread at start: a small built-in tolerance study
 * (the example double-wishbone corner, both sides, three rack positions, roll sweep, set-up), so the
 * engine's code is compiled before the first real chunk arrives. Returns the poses it solved.
 */
function warmUp(): number {
  const spec = {
    kind: 'tolerance',
    axle: 'front',
    corner: exampleCorners.fsFrontWishbone,
    vehicle: exampleVehicles.tur26Ember,
    trackProfile: 'smooth-circuit',
    samples: 400,
    chunkSamples: 400,
    seed: 1,
    tolerances: [
      { point: 'tieRodInner', axis: 'sphere', plusMinusMm: 0.5, distribution: 'normal' },
      { point: 'upperOuter', axis: 'z', plusMinusMm: 0.5, distribution: 'uniform' },
    ],
    setup: { camberShimMm: 0.5, toeAdjusterStepMm: 0.375 },
    analysis: { rackMm: [-10, 0, 10], rollDeg: 2 },
  };
  return runStudyChunk(spec, 0).poses;
}

const ENGINES: Record<TaskKind, Engine> = {
  'corner-sweep': computeCornerSweep,
  'axle-roll': computeAxleRoll,
  'corner-compliance': computeCornerCompliance,
  balance: computeBalance,
  ride: computeRide,
  solve: computeSolve,
  'rig-compare': computeRigComparison,
  'configuration-cautions': computeConfigurationCautions,
  'study-plan': planStudy,
  // The chunk leaves in its wire form made here (study-handlers.ts ComputedChunk), with the counts its landing needs.
  'study-chunk': (input) => {
    const i = input as { studyId: string; spec: unknown; chunkIndex: number };
    const chunk = runStudyChunk(studySpec(i.studyId, i.spec), i.chunkIndex);
    return { samples: chunk.samples, poses: chunk.poses, ...chunkToWire(chunk) } satisfies ComputedChunk;
  },
  // The chunks arrive as PostgreSQL gave them to the main thread (header text, outputs bytes); they are decoded
  // here. The result is the one the API serves (factors named from the stored spec's corner: withFactorLabels),
  // stored once as text.
  'study-combine': (input) => {
    const i = input as { studyId: string; spec: StudySpec; chunks: { header: string; outputs: Uint8Array | null }[] };
    const result = combineStudyChunks(
      studySpec(i.studyId, i.spec),
      i.chunks.map((c) => chunkFromWire(c.header, c.outputs)),
    );
    return withFactorLabels(result, i.spec.corner);
  },
  'study-warm': () => warmUp(),
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

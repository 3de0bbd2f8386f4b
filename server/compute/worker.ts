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
 * The warm-up a queue worker runs once on each study thread at start, so the engine's code is compiled
 * before the first real chunk arrives: five small tolerance studies of the example double-wishbone corner
 * (both sides, three rack positions, roll sweep, set-up; two sets of toleranced points), then a small design
 * sweep. Several studies, not one: each study's first chunk runs the engine on that study's new model objects,
 * and V8 re-optimises for them; measured on the 2-core machine, a thread's first real study lost about 25 ms
 * to that after one warm-up study and under 10 ms after five (about 0.2 s of warm-up in all). Returns the
 * poses solved.
 */
function warmUp(): number {
  const few = [
    { point: 'tieRodInner', axis: 'sphere', plusMinusMm: 0.5, distribution: 'normal' },
    { point: 'upperOuter', axis: 'z', plusMinusMm: 0.5, distribution: 'uniform' },
  ];
  const every = ['lowerFront', 'lowerRear', 'upperFront', 'upperRear', 'lowerOuter', 'upperOuter', 'tieRodInner', 'tieRodOuter'].map((point, i) => ({
    point,
    axis: 'sphere',
    plusMinusMm: 0.5,
    distribution: i % 2 ? 'uniform' : 'normal',
  }));
  const tolerance = (k: number) => ({
    kind: 'tolerance',
    axle: 'front',
    corner: exampleCorners.fsFrontWishbone,
    vehicle: exampleVehicles.tur26Ember,
    trackProfile: 'smooth-circuit',
    samples: 150,
    chunkSamples: 150,
    seed: k + 1,
    tolerances: k % 2 ? every : few,
    setup: { camberShimMm: 0.5, toeAdjusterStepMm: 0.375 },
    analysis: { rackMm: [-10, 0, 10], rollDeg: 2 },
  });
  let poses = 0;
  for (let k = 0; k < 5; k++) poses += runStudyChunk(tolerance(k), 0).poses;
  const sweep = {
    kind: 'sweep',
    axle: 'front',
    corner: exampleCorners.fsFrontWishbone,
    vehicle: exampleVehicles.tur26Ember,
    trackProfile: 'smooth-circuit',
    design: 'latin-hypercube',
    samples: 12,
    seed: 1,
    balanceDirection: 'more-understeer',
    factors: [{ point: 'tieRodInner', axis: 'z', fromMm: exampleCorners.fsFrontWishbone.points.tieRodInner[2] - 5, toMm: exampleCorners.fsFrontWishbone.points.tieRodInner[2] + 5 }],
  };
  return poses + runStudyChunk(sweep, 0).poses;
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

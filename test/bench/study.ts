/**
 * Study throughput (issue 16), in this process: one worker's poses per
 * second inside a 10 000-sample tolerance study of a double-wishbone corner
 * (both sides drawn, roll sweep, bump steer at three rack positions, shim
 * and adjuster set-up), chunk by chunk as a queue worker runs them, beside
 * the single-sweep cost per pose measured in the same process.
 * Target: study.posesPerSecondPerWorker ≥ 600 000, within 1.5× of the
 * single sweep's cost per pose. CPU-time figures are printed too: this
 * machine is shared, and wall time counts other processes' turns.
 */
import { exampleCorners, sweepCorner } from '../../shared/kinematics/index.js';
import { exampleVehicles } from '../../shared/balance/index.js';
import { planStudy, runStudyChunk, combineStudyChunks } from '../../shared/study/index.js';
import { median, round, timeRuns } from './stats.js';

export const benchStudySpec = {
  kind: 'tolerance',
  label: 'bench: front corner, 10 000 builds',
  axle: 'front',
  corner: exampleCorners.fsFrontWishbone,
  vehicle: exampleVehicles.tur26Ember,
  trackProfile: 'smooth-circuit',
  samples: 10_000,
  seed: 16,
  chunkSamples: 500,
  tolerances: [
    { point: 'tieRodInner', axis: 'sphere', plusMinusMm: 0.5, distribution: 'normal' },
    { point: 'tieRodOuter', axis: 'sphere', plusMinusMm: 0.3, distribution: 'normal' },
    { point: 'upperOuter', axis: 'sphere', plusMinusMm: 0.5, distribution: 'uniform' },
    { point: 'lowerFront', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' },
    { point: 'lowerRear', axis: 'z', plusMinusMm: 0.5, distribution: 'normal' },
  ],
  setup: { camberShimMm: 0.5, toeAdjusterStepMm: 0.375 },
  analysis: { rackMm: [-10, 0, 10], rollDeg: 2 },
} as const;

export async function run(): Promise<Record<string, number>> {
  const spec = structuredClone(benchStudySpec);
  const plan = planStudy(spec);
  // Warm the JIT on two chunks, then time the whole study.
  runStudyChunk(spec, 0);
  runStudyChunk(spec, 1);
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  const chunks = [];
  let poses = 0;
  for (let i = 0; i < plan.chunkCount; i++) {
    const c = runStudyChunk(spec, i);
    poses += c.poses;
    chunks.push(c);
  }
  const wallS = (performance.now() - t0) / 1000;
  const cpu = process.cpuUsage(cpu0);
  const cpuS = (cpu.user + cpu.system) / 1e6;
  const t1 = performance.now();
  const result = combineStudyChunks(spec, chunks);
  const combineS = (performance.now() - t1) / 1000;
  if (result.failedSamples > 0) throw new Error(`bench study: ${result.failedSamples} samples failed: ${result.failures[0]?.message}`);

  // The single sweep's cost per pose, in this process (kinematics bench's sweep505).
  const sweep = () => sweepCorner(exampleCorners.fsFrontWishbone, { travel: { from: -25, to: 25, step: 0.5 }, rackMm: [-20, -10, 0, 10, 20] });
  const sweepMs = median(timeRuns(sweep, 60, 20));
  const sweepUsPerPose = (sweepMs * 1000) / 505;
  const studyUsPerPose = (wallS * 1e6) / poses;
  console.log('  targets: posesPerSecondPerWorker ≥ 600 000, study cost per pose within 1.5× of the single sweep’s');
  return {
    'study.posesPerSecondPerWorker': round(poses / wallS, 0),
    'study.posesPerSecondPerWorkerCpu': round(poses / cpuS, 0),
    'study.tolerance10k.inProcessS': round(wallS, 2),
    'study.tolerance10k.inProcessCpuS': round(cpuS, 2),
    'study.tolerance10k.combineS': round(combineS, 2),
    'study.posesPerSample': round(poses / plan.totalSamples, 1),
    'study.usPerPose': round(studyUsPerPose, 3),
    'study.singleSweepUsPerPose': round(sweepUsPerPose, 3),
    'study.costPerPoseVsSweep': round(studyUsPerPose / sweepUsPerPose, 2),
  };
}

/**
 * Kinematics benchmark (issue 3): a double-wishbone sweep of 101 travel
 * points × 5 rack positions (505 poses, all per-pose outputs), the same
 * sweep by a generic solve of the same equations (numeric Jacobian, dense
 * solve through mathjs lusolve, continued along the sweep with a secant
 * predictor, which needs no derivatives), and the roll sweep ±3° in 0.1°
 * steps.
 * Targets: sweep median ≤ 2 ms, ≥ 30× the generic solve.
 */
import { lusolve } from 'mathjs';
import { exampleCorners, sweepCorner, sweepTravels, rollSweep, compileCorner, CornerSolver, poseRow, type CornerModel, type PoseRow } from '../../shared/kinematics/index.js';
import { getHeapSpaceStatistics, setFlagsFromString } from 'node:v8';
import { runInNewContext } from 'node:vm';
import { median, round, timeRuns } from './stats.js';

const corner = exampleCorners.fsFrontWishbone;
const travel = { from: -25, to: 25, step: 0.5 };
const racks = [-20, -10, 0, 10, 20];

function fastSweep() {
  return sweepCorner(corner, { travel, rackMm: racks });
}

/** R = exp([θ]×) (absolute rotation vector). */
function rodrigues(t: number[]): number[] {
  const th = Math.hypot(t[0]!, t[1]!, t[2]!);
  const a = th < 1e-12 ? 1 : Math.sin(th) / th;
  const b = th < 1e-12 ? 0.5 : (1 - Math.cos(th)) / (th * th);
  const [x, y, z] = t as [number, number, number];
  return [1 - b * (y * y + z * z), -a * z + b * x * y, a * y + b * x * z, a * z + b * x * y, 1 - b * (x * x + z * z), -a * x + b * y * z, -a * y + b * x * z, a * x + b * y * z, 1 - b * (x * x + y * y)];
}

/** The same six equations as the solver (distance rows in mm, driving row), evaluated generically (rack along +y, as in this corner). */
function residuals(m: CornerModel, x: number[], travelMm: number, rackMm: number): number[] {
  const R = rodrigues(x.slice(3));
  const f: number[] = [];
  for (let i = 0; i < m.nDist; i++) {
    const r = [m.localPts[3 * i]!, m.localPts[3 * i + 1]!, m.localPts[3 * i + 2]!];
    const p = [0, 1, 2].map((k) => x[k]! + R[3 * k]! * r[0]! + R[3 * k + 1]! * r[1]! + R[3 * k + 2]! * r[2]!);
    const a = [m.bodyPts[3 * i]!, m.bodyPts[3 * i + 1]! + (i === m.steerRow ? rackMm : 0), m.bodyPts[3 * i + 2]!];
    const L = m.lengths[i]!;
    f.push(((p[0]! - a[0]!) ** 2 + (p[1]! - a[1]!) ** 2 + (p[2]! - a[2]!) ** 2 - L * L) / (2 * L));
  }
  f.push(x[2]! - (m.wc0[2] + travelMm));
  return f;
}

/** Generic Newton: forward-difference Jacobian, mathjs lusolve, from the start point it is given. */
function genericSolve(m: CornerModel, x: number[], travelMm: number, rackMm: number): number {
  let it = 0;
  for (; it < 50; it++) {
    const f = residuals(m, x, travelMm, rackMm);
    if (Math.max(...f.map(Math.abs)) < 1e-10) return it;
    const h = 1e-7;
    const J = f.map(() => new Array<number>(6).fill(0));
    for (let j = 0; j < 6; j++) {
      const xh = x.slice();
      xh[j]! += h;
      const fh = residuals(m, xh, travelMm, rackMm);
      for (let i = 0; i < 6; i++) J[i]![j] = (fh[i]! - f[i]!) / h;
    }
    const dx = lusolve(J, f.map((v) => [-v])) as number[][];
    for (let j = 0; j < 6; j++) x[j]! += dx[j]![0]!;
  }
  throw new Error('generic solve did not converge');
}

let genericIterations = 0;

function genericSweep(): PoseRow[] {
  const m = compileCorner(corner);
  const s = new CornerSolver(m, 'left');
  const out: PoseRow[] = [];
  const travels = Array.from({ length: 101 }, (_, i) => travel.from + i * travel.step);
  for (const rack of racks) {
    const x = [m.wc0[0], m.wc0[1], m.wc0[2], 0, 0, 0];
    let last: number[] | null = null;
    let older: number[] | null = null;
    for (const t of travels) {
      // Generic continuation: from the previous solution (x) extrapolated linearly through the one before
      // (secant predictor: needs no derivatives, so any generic solver can use it).
      if (last && older) for (let j = 0; j < 6; j++) x[j]! += x[j]! - older[j]!;
      genericIterations += genericSolve(m, x, t, rack);
      older = last;
      last = x.slice();
      // Same per-pose outputs: hand the converged pose to the output code (0 Newton iterations, tangents only).
      s.c.set(x.slice(0, 3));
      s.R.set(rodrigues(x.slice(3)));
      s.solve(t, rack);
      out.push(poseRow(s));
    }
  }
  return out;
}

/** A callable gc() (V8 flag set at run time), so heap growth counts what one sweep allocates. */
function getGc(): () => void {
  setFlagsFromString('--expose-gc');
  return runInNewContext('gc') as () => void;
}

/** Bytes in V8's young generation (where every new object starts; compiled code lives elsewhere). */
function youngBytes(): number {
  return getHeapSpaceStatistics().find((s) => s.space_name === 'new_space')!.space_used_size;
}

/** Median over seven runs of what one call allocates (KB): young-generation growth, each run after a full GC. */
function heapGrowthKB(fn: () => unknown, gc: () => void): number {
  const kb: number[] = [];
  for (let i = 0; i < 7; i++) {
    gc();
    const h0 = youngBytes();
    fn();
    kb.push((youngBytes() - h0) / 1024);
  }
  return median(kb);
}

export async function run(): Promise<Record<string, number>> {
  // Heap growth of the solve alone first, on a JIT that has seen nothing else.
  const gc = getGc();
  const m = compileCorner(corner);
  const solver = new CornerSolver(m, 'left');
  const travels = Array.from({ length: 101 }, (_, i) => travel.from + i * travel.step);
  const solveOnly = () => {
    for (const r of racks) sweepTravels(solver, travels, r, () => {});
  };
  for (let i = 0; i < 60; i++) solveOnly(); // warm, so the figure is the optimised code's
  const solveHeap = heapGrowthKB(solveOnly, gc);
  const first = fastSweep();
  // The fast sweep alone on a warm JIT (the sweep505 figure) ...
  const aloneMs = timeRuns(fastSweep, 100, 30);
  const rollMs = timeRuns(() => rollSweep(exampleCorners.fsFrontWishbone, { roll: { from: -3, to: 3, step: 0.1 } }), 60, 10);

  const sweepHeap = heapGrowthKB(fastSweep, gc);

  genericIterations = 0;
  const check = genericSweep();
  const genericIterationsPerPose = genericIterations / check.length;
  // Both solve the same equations: same toe at the same pose.
  const a = first.rows.find((r) => r.rackMm === 10 && r.travelMm === 20)!;
  const b = check.find((r) => r.rackMm === 10 && r.travelMm === 20)!;
  if (Math.abs(a.toeDeg - b.toeDeg) > 1e-6) throw new Error(`fast and generic solves disagree: ${a.toeDeg} vs ${b.toeDeg}`);
  // ... and, for the speed-up, both interleaved so they see the same machine load (the machine is shared):
  // one generic run, then ten fast ones (these fast runs also pay for the generic run's garbage).
  genericSweep();
  const fastMs: number[] = [];
  const genericMs: number[] = [];
  for (let round = 0; round < 11; round++) {
    genericMs.push(...timeRuns(genericSweep, 1, 0));
    fastMs.push(...timeRuns(fastSweep, 10, 1));
  }

  const med = median(aloneMs);
  const medInterleaved = median(fastMs);
  const gen = median(genericMs);
  console.log('  targets: sweep505 median ≤ 2 ms, speedup ≥ 30×; heap growth: the whole sweep (result rows) and the solve alone (Newton loop, should be ~0)');
  return {
    'kinematics.sweep505.medianMs': round(med, 3),
    'kinematics.usPerPose': round((med * 1000) / first.rows.length, 3),
    'kinematics.iterationsPerPose': round(first.diagnostics.iterationsPerPose, 3),
    'kinematics.genericSweep505.medianMs': round(gen, 2),
    'kinematics.genericIterationsPerPose': round(genericIterationsPerPose, 3),
    'kinematics.speedupVsGeneric': round(gen / medInterleaved, 1),
    'kinematics.sweep505Interleaved.medianMs': round(medInterleaved, 3),
    'kinematics.rollSweep.medianMs': round(median(rollMs), 3),
    'kinematics.sweep505.heapGrowthKB': round(sweepHeap, 1),
    'kinematics.solveOnly505.heapGrowthKB': round(solveHeap, 1),
  };
}

/**
 * Compliance of one corner about a solved pose (docs/compliance.md): linear
 * elastic equilibrium of the upright and every arm as rigid bodies on their
 * bushings, under unit loads at the tyre, with the wheel-centre height held
 * at the pose (spring and tyre carry the vertical load).
 *
 * Formulation (flexibility method on the kinematic constraint rows): the
 * pose solver's six rows (five link / arm-leg / strut rows and the
 * wheel-centre height) have the Jacobian A (6×6) with respect to the
 * upright's small motion x = (δc, δω). Each row's generalised force λ (link
 * tension, N) stretches the elastic parts in that row by C·λ, with C the
 * rows' compliance (block-diagonal: 1×1 per single link, 2×2 per arm on its
 * two legs, 2×2 for a strut top mount; 0 for the height row). Equilibrium
 * Aᵀλ = f and compatibility A·x = C·λ give
 *
 *     λ = A⁻ᵀ f,    x = G f,    G = A⁻¹ C A⁻ᵀ
 *
 * G is the compliance matrix of the upright at the wheel centre (symmetric:
 * Maxwell–Betti). An arm's 2×2 block is the flexibility of a rigid arm on
 * its two pivot bushings (plus a compliant ball joint if given), with the
 * statically indeterminate split of the load along the pivot axis set by
 * least complementary energy (Menabrea); a single link's rows add its
 * series compliances (end bushings axially, the link itself, and the
 * steering system through the rack direction). Nothing here touches the
 * pose solver's loops: the rows are rebuilt from the solved state.
 */
import { SolveError } from '../errors.js';
import type { Bushing } from '../schema/corner.js';
import { BUSHING_POINTS } from '../schema/corner-rules.js';
import type { CornerModel } from '../kinematics/model.js';
import type { CornerSolver } from '../kinematics/solver.js';
import { DEG_PER_RAD } from '../angles.js';
import { luFactor, luSolve, luSolveTransposed } from '../numeric/lu.js';

/** The unit loads at the tyre (left corner). */
export const LOAD_NAMES = ['lateralForce', 'aligningMoment', 'brakingForce', 'tractionForce', 'verticalForce'] as const;
export type LoadName = (typeof LOAD_NAMES)[number];

export const LOAD_DESCRIPTIONS: Record<LoadName, string> = {
  lateralForce: 'lateral force at the contact patch, inboard (−y), as on the outside wheel of a turn',
  aligningMoment: 'moment about +z (vertical) at the contact patch',
  brakingForce: 'braking force at the contact patch, rearward (−x); brake torque reacted by the upright',
  tractionForce: 'traction force at the wheel centre, forward (+x); drive torque reacted through the shaft',
  verticalForce: 'vertical force at the contact patch, upward (+z); carried by the spring and tyre (wheel-centre height held)',
};

interface Rates {
  /** Compliances, mm/N (0 = rigid). */
  radial: number;
  axial: number;
}

type Row =
  | { kind: 'link'; row: number; name: string; inner: string; outer: string; series: number; innerRates: Rates | null; outerRates: Rates | null; steer: boolean }
  | { kind: 'arm'; rows: [number, number]; name: string; front: string; rear: string; outer: string; fr: Rates | null; rr: Rates | null; joint: Rates | null }
  | { kind: 'strut'; rows: [number, number]; name: string; top: string; rates: Rates | null };

/** A corner's elastic description, compiled once per corner. */
export interface ComplianceSpec {
  rows: Row[];
  /** No elastic element given: the corner is rigid (zero compliance). */
  rigid: boolean;
  /** Steering stiffness as a compliance, mm/N (0 = rigid). */
  steering: number;
  /** Names of the row forces, in row order (tension positive). */
  forceNames: string[];
  /** Every point that carries a mount force, in report order. */
  mountPoints: string[];
}

const specCache = new WeakMap<CornerModel, ComplianceSpec>();

function rates(b: Bushing | undefined): Rates | null {
  return b ? { radial: 1 / b.radialNPerMm, axial: 1 / b.axialNPerMm } : null;
}

/** The elastic description of a compiled corner (cached per model). */
export function complianceSpec(m: CornerModel): ComplianceSpec {
  const hit = specCache.get(m);
  if (hit) return hit;
  const c = m.corner;
  const b = (c.bushings ?? {}) as Record<string, Bushing | undefined>;
  const la = (c.linkAxialNPerMm ?? {}) as Record<string, number | undefined>;
  const steering = c.steered && c.steeringStiffnessNPerMm ? 1 / c.steeringStiffnessNPerMm : 0;
  const rows: Row[] = [];
  const link = (row: number, key: string, inner: string, outer: string, steer: boolean): Row => ({
    kind: 'link',
    row,
    name: key,
    inner,
    outer,
    series: la[key] ? 1 / la[key] : 0,
    innerRates: rates(b[inner]),
    outerRates: rates(b[outer]),
    steer,
  });
  const arm = (r0: number, name: string, front: string, rear: string, outer: string): Row => ({
    kind: 'arm',
    rows: [r0, r0 + 1],
    name,
    front,
    rear,
    outer,
    fr: rates(b[front]),
    rr: rates(b[rear]),
    joint: rates(b[outer]),
  });
  const forceNames: string[] = [];
  if (c.type === 'double-wishbone') {
    rows.push(arm(0, 'lowerArm', 'lowerFront', 'lowerRear', 'lowerOuter'), arm(2, 'upperArm', 'upperFront', 'upperRear', 'upperOuter'));
    rows.push(link(4, 'tieRod', 'tieRodInner', 'tieRodOuter', c.steered));
    forceNames.push('lowerArmFrontLeg', 'lowerArmRearLeg', 'upperArmFrontLeg', 'upperArmRearLeg', c.steered ? 'tieRod' : 'toeLink');
  } else if (c.type === 'strut') {
    rows.push(arm(0, 'lowerArm', 'lowerFront', 'lowerRear', 'lowerOuter'));
    rows.push(link(2, 'tieRod', 'tieRodInner', 'tieRodOuter', c.steered));
    rows.push({ kind: 'strut', rows: [3, 4], name: 'strut', top: 'strutTop', rates: rates(b['strutTop']) });
    forceNames.push('lowerArmFrontLeg', 'lowerArmRearLeg', c.steered ? 'tieRod' : 'toeLink');
  } else {
    for (let i = 1; i <= 5; i++) {
      rows.push(link(i - 1, `link${i}`, `link${i}Inner`, `link${i}Outer`, c.steered && i === c.toeLink));
      forceNames.push(`link${i}`);
    }
  }
  const rigid = steering === 0 && Object.values(b).every((v) => v === undefined) && Object.values(la).every((v) => v === undefined);
  const spec: ComplianceSpec = { rows, rigid, steering, forceNames, mountPoints: [...BUSHING_POINTS[c.type]] };
  specCache.set(m, spec);
  return spec;
}

// ---------- small dense algebra (6×6, row-major) ----------

/** LU with partial pivoting of a 6×6 matrix in place; false when singular (a pivot below 1e-12 of the largest entry). */
function lu6(A: Float64Array, piv: Int32Array): boolean {
  let scale = 0;
  for (let i = 0; i < 36; i++) scale = Math.max(scale, Math.abs(A[i]!));
  return luFactor(A, 6, piv, 1e-12 * scale);
}

// ---------- per-pose evaluation ----------

/** A bushing or joint compliance tensor applied to v: radial·(v − (v·n)n) + axial·(v·n)n. */
function applyRates(r: Rates, n: ArrayLike<number>, v: ArrayLike<number>): [number, number, number] {
  const vn = v[0]! * n[0]! + v[1]! * n[1]! + v[2]! * n[2]!;
  const d = r.axial - r.radial;
  return [r.radial * v[0]! + d * vn * n[0]!, r.radial * v[1]! + d * vn * n[1]!, r.radial * v[2]! + d * vn * n[2]!];
}
const dot3 = (a: ArrayLike<number>, b: ArrayLike<number>) => a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]!;
function unit3(a: number[]): [number, number, number] {
  const l = Math.hypot(a[0]!, a[1]!, a[2]!);
  return [a[0]! / l, a[1]! / l, a[2]! / l];
}

/** Everything one pose's compliance needs, in the left frame (mm, N). */
export interface PoseCompliance {
  /** The pose's Jacobian rows A (6×6) factored, its pivots, and the row compliance C (6×6). */
  lu: Float64Array;
  piv: Int32Array;
  C: Float64Array;
  /** G = A⁻¹ C A⁻ᵀ, 6×6 symmetric, coordinates (δc mm, δω rad) against (force N, moment N·mm) at the wheel centre. */
  G: Float64Array;
  /** Wheel centre, contact patch and spin axis at the pose. */
  c: [number, number, number];
  cp: [number, number, number];
  spin: [number, number, number];
  radius: number;
  /** Current upright points (row ends), body points and row directions, for the force report. */
  bodyPts: Float64Array;
  uprightPts: Float64Array;
  dirs: Float64Array;
  /** Arm pivot axes (unit, front → rear) by row index of the arm's first row. */
  armAxes: Map<number, [number, number, number]>;
  /** Kingpin direction (unit, upward), for compliant ball joints; null for a five-link corner. */
  kingpin: [number, number, number] | null;
  /** Strut: the two upright-fixed directions of the top-mount rows and the strut axis. */
  strutE: [[number, number, number], [number, number, number]] | null;
  strutAxis: [number, number, number] | null;
  /** Unit direction the tie-rod inner point moves per mm of steering input. */
  steerDir: [number, number, number];
}

// Scratch of evaluatePoseCompliance (single-threaded; not part of the result).
const scratchY = new Float64Array(36);
const scratchCol = new Float64Array(6);

/**
 * Builds A and C at the solver's current (converged) pose and forms G.
 * Throws SolveError when the rows do not locate the upright (singular pose).
 */
export function evaluatePoseCompliance(s: CornerSolver, spec: ComplianceSpec = complianceSpec(s.model)): PoseCompliance {
  const m = s.model;
  const R = s.R;
  const c: [number, number, number] = [s.c[0]!, s.c[1]!, s.c[2]!];
  const A = new Float64Array(36);
  const bodyPts = new Float64Array(15);
  const uprightPts = new Float64Array(15);
  const dirs = new Float64Array(15);
  for (let i = 0; i < m.nDist; i++) {
    const k = 3 * i;
    const rx = m.localPts[k]!;
    const ry = m.localPts[k + 1]!;
    const rz = m.localPts[k + 2]!;
    const dx = R[0]! * rx + R[1]! * ry + R[2]! * rz;
    const dy = R[3]! * rx + R[4]! * ry + R[5]! * rz;
    const dz = R[6]! * rx + R[7]! * ry + R[8]! * rz;
    const src = i === m.steerRow ? s.steerInner : m.bodyPts.subarray(k, k + 3);
    bodyPts[k] = src[0]!;
    bodyPts[k + 1] = src[1]!;
    bodyPts[k + 2] = src[2]!;
    uprightPts[k] = c[0] + dx;
    uprightPts[k + 1] = c[1] + dy;
    uprightPts[k + 2] = c[2] + dz;
    const ex = c[0] + dx - src[0]!;
    const ey = c[1] + dy - src[1]!;
    const ez = c[2] + dz - src[2]!;
    const il = 1 / Math.sqrt(ex * ex + ey * ey + ez * ez);
    const nx = ex * il;
    const ny = ey * il;
    const nz = ez * il;
    dirs[k] = nx;
    dirs[k + 1] = ny;
    dirs[k + 2] = nz;
    const row = 6 * i;
    A[row] = nx;
    A[row + 1] = ny;
    A[row + 2] = nz;
    A[row + 3] = dy * nz - dz * ny;
    A[row + 4] = dz * nx - dx * nz;
    A[row + 5] = dx * ny - dy * nx;
  }
  let strutE: PoseCompliance['strutE'] = null;
  let strutAxis: PoseCompliance['strutAxis'] = null;
  if (m.strut) {
    const st = m.strut;
    const rot = (v: ArrayLike<number>): [number, number, number] => [
      R[0]! * v[0]! + R[1]! * v[1]! + R[2]! * v[2]!,
      R[3]! * v[0]! + R[4]! * v[1]! + R[5]! * v[2]!,
      R[6]! * v[0]! + R[7]! * v[1]! + R[8]! * v[2]!,
    ];
    const e1 = rot(st.e1);
    const e2 = rot(st.e2);
    strutE = [e1, e2];
    const ax = [e1[1] * e2[2] - e1[2] * e2[1], e1[2] * e2[0] - e1[0] * e2[2], e1[0] * e2[1] - e1[1] * e2[0]];
    strutAxis = unit3(ax);
    const tx = st.top[0]! - c[0];
    const ty = st.top[1]! - c[1];
    const tz = st.top[2]! - c[2];
    for (let j = 0; j < 2; j++) {
      const e = j === 0 ? e1 : e2;
      const row = 6 * (m.nDist + j);
      A[row] = -e[0];
      A[row + 1] = -e[1];
      A[row + 2] = -e[2];
      A[row + 3] = e[1] * tz - e[2] * ty;
      A[row + 4] = e[2] * tx - e[0] * tz;
      A[row + 5] = e[0] * ty - e[1] * tx;
    }
  }
  A[32] = 1; // height row: δc_z

  // Kingpin (for compliant ball joints).
  let kingpin: [number, number, number] | null = null;
  if (m.corner.type === 'double-wishbone') kingpin = unit3([uprightPts[6]! - uprightPts[0]!, uprightPts[7]! - uprightPts[1]!, uprightPts[8]! - uprightPts[2]!]);
  else if (m.strut) kingpin = unit3([m.strut.top[0]! - uprightPts[0]!, m.strut.top[1]! - uprightPts[1]!, m.strut.top[2]! - uprightPts[2]!]);
  const steerDir: [number, number, number] = [s.steerInnerRate[0]!, s.steerInnerRate[1]!, s.steerInnerRate[2]!];

  // Row compliance C.
  const C = new Float64Array(36);
  const armAxes = new Map<number, [number, number, number]>();
  for (const r of spec.rows) {
    if (r.kind === 'link') {
      const k = 3 * r.row;
      const n = dirs.subarray(k, k + 3);
      let cc = r.series;
      if (r.innerRates) cc += r.innerRates.axial;
      if (r.outerRates) cc += r.outerRates.axial;
      if (r.steer && spec.steering) {
        const nu = dot3(n, steerDir);
        cc += spec.steering * nu * nu;
      }
      C[7 * r.row] = cc;
    } else if (r.kind === 'arm') {
      const [i, j] = r.rows;
      const nf = dirs.subarray(3 * i, 3 * i + 3);
      const nr = dirs.subarray(3 * j, 3 * j + 3);
      const a = unit3([bodyPts[3 * j]! - bodyPts[3 * i]!, bodyPts[3 * j + 1]! - bodyPts[3 * i + 1]!, bodyPts[3 * j + 2]! - bodyPts[3 * i + 2]!]);
      armAxes.set(i, a);
      // Truss part: each leg loads its own pivot.
      let cff = r.fr ? dot3(nf, applyRates(r.fr, a, nf)) : 0;
      let crr = r.rr ? dot3(nr, applyRates(r.rr, a, nr)) : 0;
      let cfr = 0;
      // The self-equilibrated pair ±s·a along the pivot axis (the statically indeterminate part), minimised out.
      const ra = (r.fr?.axial ?? 0) + (r.rr?.axial ?? 0);
      if (ra > 0) {
        const pf = r.fr ? r.fr.axial * dot3(nf, a) : 0;
        const pr = r.rr ? -r.rr.axial * dot3(nr, a) : 0;
        cff -= (pf * pf) / ra;
        crr -= (pr * pr) / ra;
        cfr -= (pf * pr) / ra;
      }
      if (r.joint && kingpin) {
        const jf = applyRates(r.joint, kingpin, nf);
        cff += dot3(nf, jf);
        crr += dot3(nr, applyRates(r.joint, kingpin, nr));
        cfr += dot3(nr, jf);
      }
      C[6 * i + i] = cff;
      C[6 * j + j] = crr;
      C[6 * i + j] = cfr;
      C[6 * j + i] = cfr;
    } else if (r.rates && strutE) {
      const [i, j] = r.rows;
      const ax = strutAxis!;
      const e1 = strutE[0];
      const e2 = strutE[1];
      const t1 = applyRates(r.rates, ax, e1);
      C[6 * i + i] = dot3(e1, t1);
      C[6 * j + j] = dot3(e2, applyRates(r.rates, ax, e2));
      C[6 * i + j] = C[6 * j + i] = dot3(e2, t1);
    }
  }

  const lu = A;
  const piv = new Int32Array(6);
  if (!lu6(lu, piv)) {
    throw new SolveError('singular_geometry', `Compliance cannot be computed at travel ${s.travelMm} mm, rack ${s.rackMm} mm: the links do not locate the upright (singular pose)`, {
      travelMm: s.travelMm,
      rackMm: s.rackMm,
    });
  }
  // G = A⁻¹ C A⁻ᵀ: Y = A⁻¹ C (columns), then G = A⁻¹ Yᵀ (Yᵀ = C A⁻ᵀ as C is symmetric).
  const G = new Float64Array(36);
  if (!spec.rigid) {
    const Y = scratchY;
    const col = scratchCol;
    for (let j = 0; j < 6; j++) {
      for (let i = 0; i < 6; i++) col[i] = C[6 * i + j]!;
      luSolve(lu, 6, piv, col);
      for (let i = 0; i < 6; i++) Y[6 * i + j] = col[i]!;
    }
    for (let j = 0; j < 6; j++) {
      // Column j of G = A⁻¹ · (row j of Y)ᵀ.
      for (let i = 0; i < 6; i++) col[i] = Y[6 * j + i]!;
      luSolve(lu, 6, piv, col);
      for (let i = 0; i < 6; i++) G[6 * i + j] = col[i]!;
    }
  }

  const s0 = m.spin0;
  const spin: [number, number, number] = [R[0]! * s0[0] + R[1]! * s0[1] + R[2]! * s0[2], R[3]! * s0[0] + R[4]! * s0[1] + R[5]! * s0[2], R[6]! * s0[0] + R[7]! * s0[1] + R[8]! * s0[2]];
  const nx = spin[2] * spin[0];
  const ny = spin[2] * spin[1];
  const nz = -1 + spin[2] * spin[2];
  const f = m.radius / Math.sqrt(nx * nx + ny * ny + nz * nz);
  const cp: [number, number, number] = [c[0] + f * nx, c[1] + f * ny, c[2] + f * nz];
  return { lu, piv, C, G, c, cp, spin, radius: m.radius, bodyPts, uprightPts, dirs, armAxes, kingpin, strutE, strutAxis, steerDir };
}

/** Generalised force (force N, moment N·mm about the wheel centre) of a unit load, written into f. */
export function unitLoad(pc: PoseCompliance, load: LoadName, f: Float64Array): void {
  f.fill(0);
  const at = (p: readonly number[], F: readonly [number, number, number]) => {
    const rx = p[0]! - pc.c[0];
    const ry = p[1]! - pc.c[1];
    const rz = p[2]! - pc.c[2];
    f[0] = F[0];
    f[1] = F[1];
    f[2] = F[2];
    f[3] = ry * F[2] - rz * F[1];
    f[4] = rz * F[0] - rx * F[2];
    f[5] = rx * F[1] - ry * F[0];
  };
  if (load === 'lateralForce') at(pc.cp, [0, -1, 0]);
  else if (load === 'aligningMoment') f[5] = 1000; // 1 N·m
  else if (load === 'brakingForce') at(pc.cp, [-1, 0, 0]);
  else if (load === 'tractionForce') at(pc.c, [1, 0, 0]);
  else at(pc.cp, [0, 0, 1]);
}

/** The wheel's response to one generalised force (per unit load: 1 N, or 1 N·m). */
export interface LoadResponse {
  /** Upright motion: wheel-centre translation (mm) and rotation (rad), left frame. */
  x: Float64Array;
  /** Row forces (tension positive, N) and the vertical support (spring and tyre) in [5]. */
  lambda: Float64Array;
  toeDeg: number;
  camberDeg: number;
  /** Contact-patch displacement, mm (the geometric contact point of the wheel). */
  contactPatchMm: [number, number, number];
}

/** Toe and camber change (deg) of the upright rotation δω at the pose (left wheel: toe = −δ). */
export function toeCamberOf(pc: PoseCompliance, w: ArrayLike<number>): { toeDeg: number; camberDeg: number; da: [number, number, number] } {
  const a = pc.spin;
  const dax = w[1]! * a[2] - w[2]! * a[1];
  const day = w[2]! * a[0] - w[0]! * a[2];
  const daz = w[0]! * a[1] - w[1]! * a[0];
  const dSteer = (a[0] * day - a[1] * dax) / (a[0] * a[0] + a[1] * a[1]);
  return { toeDeg: -dSteer * DEG_PER_RAD, camberDeg: (-daz / Math.sqrt(1 - a[2] * a[2])) * DEG_PER_RAD, da: [dax, day, daz] };
}

/** Solves one load at the pose. */
export function respond(pc: PoseCompliance, f: Float64Array): LoadResponse {
  const x = new Float64Array(6);
  for (let i = 0; i < 6; i++) {
    let v = 0;
    for (let j = 0; j < 6; j++) v += pc.G[6 * i + j]! * f[j]!;
    x[i] = v;
  }
  const lambda = Float64Array.from(f);
  luSolveTransposed(pc.lu, 6, pc.piv, lambda);
  const { toeDeg, camberDeg, da } = toeCamberOf(pc, x.subarray(3, 6));
  // Contact point c + r·n̂, n = a_z·a − ẑ: dn = da_z·a + a_z·da.
  const a = pc.spin;
  const n = [a[2] * a[0], a[2] * a[1], -1 + a[2] * a[2]];
  const ln = Math.hypot(n[0]!, n[1]!, n[2]!);
  const nh = [n[0]! / ln, n[1]! / ln, n[2]! / ln];
  const dn = [da[2] * a[0] + a[2] * da[0], da[2] * a[1] + a[2] * da[1], da[2] * a[2] + a[2] * da[2]];
  const p = dot3(nh, dn);
  const cpd: [number, number, number] = [0, 1, 2].map((k) => x[k]! + (pc.radius * (dn[k]! - nh[k]! * p)) / ln) as [number, number, number];
  return { x, lambda, toeDeg, camberDeg, contactPatchMm: cpd };
}

/** Force a mount passes to the body (N, left frame), split into axial (signed, along its axis) and radial parts. */
export interface MountForce {
  forceN: [number, number, number];
  axialN: number;
  radialN: number;
}

function mount(F: [number, number, number], axis: ArrayLike<number> | null): MountForce {
  const ax = axis ? dot3(F, axis) : 0;
  const tot = Math.hypot(F[0], F[1], F[2]);
  return { forceN: F, axialN: ax, radialN: Math.sqrt(Math.max(0, tot * tot - ax * ax)) };
}

/**
 * Forces in every mount for row forces λ: what each body point passes to the
 * body and each ball joint to its arm. An arm's load along its pivot axis is
 * shared between its pivots by their axial rates (the indeterminate split; a
 * rigid or absent axial rate takes it all, two rigid ones split as a truss).
 */
export function mountForces(pc: PoseCompliance, spec: ComplianceSpec, lambda: ArrayLike<number>): Record<string, MountForce> {
  const out: Record<string, MountForce> = {};
  const v = (arr: Float64Array, i: number): [number, number, number] => [arr[3 * i]!, arr[3 * i + 1]!, arr[3 * i + 2]!];
  for (const r of spec.rows) {
    if (r.kind === 'link') {
      const n = v(pc.dirs, r.row);
      const l = lambda[r.row]!;
      const F: [number, number, number] = [l * n[0], l * n[1], l * n[2]];
      out[r.inner] = mount(F, n);
      out[r.outer] = mount(F, n);
    } else if (r.kind === 'arm') {
      const [i, j] = r.rows;
      const nf = v(pc.dirs, i);
      const nr = v(pc.dirs, j);
      const a = pc.armAxes.get(i)!;
      const lf = lambda[i]!;
      const lr = lambda[j]!;
      const kf = r.fr ? r.fr.axial : 0;
      const kr = r.rr ? r.rr.axial : 0;
      let s = 0;
      if (kf + kr > 0) s = -(lf * kf * dot3(nf, a) - lr * kr * dot3(nr, a)) / (kf + kr);
      const FA: [number, number, number] = [lf * nf[0] + s * a[0], lf * nf[1] + s * a[1], lf * nf[2] + s * a[2]];
      const FB: [number, number, number] = [lr * nr[0] - s * a[0], lr * nr[1] - s * a[1], lr * nr[2] - s * a[2]];
      out[r.front] = mount(FA, a);
      out[r.rear] = mount(FB, a);
      out[r.outer] = mount([FA[0] + FB[0], FA[1] + FB[1], FA[2] + FB[2]], pc.kingpin);
    } else if (pc.strutE) {
      const [i, j] = r.rows;
      const [e1, e2] = pc.strutE;
      const l1 = lambda[i]!;
      const l2 = lambda[j]!;
      out[r.top] = mount([-(l1 * e1[0] + l2 * e2[0]), -(l1 * e1[1] + l2 * e2[1]), -(l1 * e1[2] + l2 * e2[2])], pc.strutAxis);
    }
  }
  return out;
}

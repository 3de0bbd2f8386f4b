/**
 * Pose solver for one corner: six unknowns (wheel-centre position c, mm, and
 * the upright's rotation R), five link / strut constraints plus the driving
 * equation c_z = design z + travel. Newton's method with an analytic
 * Jacobian (rotation updated multiplicatively, R ← exp([δω]×)·R, so a point
 * P = c + R·r moves by δc + δω × (P − c)), backtracking on the residual,
 * warm-started and predicted along the pose tangent. The Newton loop works
 * only in preallocated Float64Arrays.
 *
 * Residuals are in mm: distance rows (|P − A|² − L²)/(2L) ≈ |P − A| − L,
 * strut rows (T − S)·e (perpendicular offsets of the top mount from the
 * upright-fixed strut axis).
 */
import { SolveError } from '../errors.js';
import type { CornerModel, Side } from './model.js';
import { rotateOffsetInto } from './vec.js';
import { luFactor, luSolve } from '../numeric/lu.js';

/** Convergence tolerance on every residual row, mm. */
export const RESIDUAL_TOL_MM = 1e-10;
const MAX_ITER = 40;

export interface SolveDiagnostics {
  converged: true;
  iterations: number;
  /** Largest residual row at convergence, mm. */
  residualMm: number;
}

export class CornerSolver {
  /** Wheel-centre position, mm (left frame). */
  readonly c = new Float64Array(3);
  /** Upright rotation from the design pose, row-major 3×3. */
  readonly R = new Float64Array(9);
  /** Pose tangent per mm of travel: [dc (mm/mm), dω (rad/mm)]. */
  readonly tTravel = new Float64Array(6);
  /** Pose tangent per mm of steering input (rack or arm arc). */
  readonly tSteer = new Float64Array(6);
  /** Current tie-rod / toe-link inner point and its derivative per mm of steering input. */
  readonly steerInner = new Float64Array(3);
  readonly steerInnerRate = new Float64Array(3);
  /** Travel and steering input of the current pose. */
  travelMm = 0;
  rackMm = 0;
  iterations = 0;
  residualMm = 0;
  /** Lever angles of rocker and bar at the current pose as [cos, sin, cos, sin], for branch continuity. */
  readonly levers = new Float64Array(4);

  private readonly g = new Float64Array(6);
  /**
   * Jacobian of rows 0–4 (links / strut) with respect to (δc_x, δc_y, δω_x,
   * δω_y, δω_z), 5×5 row-major, factored in place into its LU factors by
   * `factor()` (evaluate rewrites it); `jz` is their column for δc_z. The
   * driving row (c_z − target) has Jacobian e₃, so δc_z comes straight from
   * its right-hand side and the rest is a 5×5 solve.
   */
  private readonly J = new Float64Array(25);
  private readonly jz = new Float64Array(5);
  private readonly r5 = new Float64Array(5);
  private readonly piv = new Int32Array(5);
  private readonly dx = new Float64Array(6);
  /**
   * Scalars of the Newton loop kept in a typed array, not passed or returned:
   * V8 boxes a double argument or return value on the heap, so the loop
   * reads [0] largest residual (mm), [1] target wheel-centre z (mm),
   * [2] step fraction α, [3] steering input (mm) from here.
   */
  private readonly sc = new Float64Array(4);
  private readonly w = new Float64Array(3);
  private readonly w2 = new Float64Array(3);
  /**
   * Predictor memory along a travel sweep at one steering input: the travel
   * tangents of up to three previous poses, newest first (tPrev[6k..6k+5]),
   * and hist = [their travels (mm) ×3, how many are valid (0–3)].
   */
  private readonly tPrev = new Float64Array(18);
  private readonly hist = new Float64Array(4);
  private readonly c0 = new Float64Array(3);
  private readonly R0 = new Float64Array(9);
  private readonly sgn: number;
  private readonly rackDir = new Float64Array(3);
  /** Design position of the steering inner point, and rotation scratch. */
  private readonly steerInner0: Float64Array;
  private readonly rot3 = new Float64Array(3);

  constructor(
    readonly model: CornerModel,
    readonly side: Side = 'left',
  ) {
    this.sgn = side === 'left' ? 1 : -1;
    this.steerInner0 = model.bodyPts.slice(3 * model.steerRow, 3 * model.steerRow + 3);
    const st = model.steering;
    if (st?.kind === 'rack') {
      // Vehicle-frame rack displacement r·u; a right corner solved as its mirror sees r·(u_x, −u_y, u_z) (domain.md).
      this.rackDir.set([st.axis[0], this.sgn * st.axis[1], st.axis[2]]);
    } else if (!st) {
      // Unsteered: a virtual rack along y, used only for the steering tangent (five-link steering axis).
      this.rackDir.set([0, 1, 0]);
    }
    this.reset();
  }

  /** Back to the design pose (travel 0, rack 0). */
  reset(): void {
    const m = this.model;
    this.c.set(m.wc0);
    this.R.fill(0);
    this.R[0] = this.R[4] = this.R[8] = 1;
    this.travelMm = 0;
    this.rackMm = 0;
    const lv = this.levers;
    lv[0] = lv[2] = 1;
    lv[1] = lv[3] = 0;
    this.forgetHistory();
    this.sc[3] = 0;
    this.setSteer();
  }

  /**
   * Re-reads the steering link's body point after the model's arrays were
   * changed in place (a study's toleranced build moves pickups without
   * compiling a new model); the pose state is kept.
   */
  modelMoved(): void {
    const k = 3 * this.model.steerRow;
    const b = this.model.bodyPts;
    const a = this.steerInner0;
    a[0] = b[k]!;
    a[1] = b[k + 1]!;
    a[2] = b[k + 2]!;
    this.setSteer();
  }

  /**
   * Takes a solved pose's state as the current one (no solve): wheel centre,
   * rotation, travel and steering input, with the steering inner point placed
   * for that input. For reading points off a pose solved elsewhere.
   */
  place(state: { c: ArrayLike<number>; R: ArrayLike<number>; travelMm: number; rackMm: number }): void {
    this.c.set(state.c);
    this.R.set(state.R);
    this.travelMm = state.travelMm;
    this.rackMm = state.rackMm;
    this.sc[3] = state.rackMm;
    this.setSteer();
  }

  /** Places the steering inner point for input s = sc[3] (mm): rack translation or arm rotation. */
  private setSteer(): void {
    const s = this.sc[3]!;
    const m = this.model;
    const a0 = this.steerInner0;
    const st = m.steering;
    if (st?.kind === 'arm') {
      // Rotation about the arm axis by θ = s / radius (right corner: −θ in the mirrored frame).
      const q = this.rot3;
      rotateOffsetInto(q, st.dir, a0, st.point, (this.sgn * s) / st.radius);
      const ux = st.dir[0];
      const uy = st.dir[1];
      const uz = st.dir[2];
      const px = q[0]!;
      const py = q[1]!;
      const pz = q[2]!;
      this.steerInner[0] = st.point[0] + px;
      this.steerInner[1] = st.point[1] + py;
      this.steerInner[2] = st.point[2] + pz;
      const f = this.sgn / st.radius;
      this.steerInnerRate[0] = f * (uy * pz - uz * py);
      this.steerInnerRate[1] = f * (uz * px - ux * pz);
      this.steerInnerRate[2] = f * (ux * py - uy * px);
    } else {
      const d = this.rackDir;
      this.steerInner[0] = a0[0]! + s * d[0]!;
      this.steerInner[1] = a0[1]! + s * d[1]!;
      this.steerInner[2] = a0[2]! + s * d[2]!;
      this.steerInnerRate[0] = d[0]!;
      this.steerInnerRate[1] = d[1]!;
      this.steerInnerRate[2] = d[2]!;
    }
  }

  /**
   * Residuals g and Jacobian J at the current state; the largest |g| (mm) goes
   * to `sc[0]` (a returned double would be boxed on the heap).
   */
  private evaluate(): void {
    const zTarget = this.sc[1]!;
    const m = this.model;
    const c = this.c;
    const R = this.R;
    const g = this.g;
    const J = this.J;
    const jz = this.jz;
    let res = 0;
    for (let i = 0; i < m.nDist; i++) {
      const k = 3 * i;
      const rx = m.localPts[k]!;
      const ry = m.localPts[k + 1]!;
      const rz = m.localPts[k + 2]!;
      const dx = R[0]! * rx + R[1]! * ry + R[2]! * rz;
      const dy = R[3]! * rx + R[4]! * ry + R[5]! * rz;
      const dz = R[6]! * rx + R[7]! * ry + R[8]! * rz;
      let ax: number, ay: number, az: number;
      if (i === m.steerRow) {
        ax = this.steerInner[0]!;
        ay = this.steerInner[1]!;
        az = this.steerInner[2]!;
      } else {
        ax = m.bodyPts[k]!;
        ay = m.bodyPts[k + 1]!;
        az = m.bodyPts[k + 2]!;
      }
      const ex = c[0]! + dx - ax;
      const ey = c[1]! + dy - ay;
      const ez = c[2]! + dz - az;
      const L = m.lengths[i]!;
      const gi = (ex * ex + ey * ey + ez * ez - L * L) / (2 * L);
      g[i] = gi;
      const a = Math.abs(gi);
      if (a > res) res = a;
      const row = 5 * i;
      const il = 1 / L;
      J[row] = ex * il;
      J[row + 1] = ey * il;
      jz[i] = ez * il;
      J[row + 2] = (dy * ez - dz * ey) * il;
      J[row + 3] = (dz * ex - dx * ez) * il;
      J[row + 4] = (dx * ey - dy * ex) * il;
    }
    const s = m.strut;
    if (s) {
      const lx = s.lowerLocal[0]!;
      const ly = s.lowerLocal[1]!;
      const lz = s.lowerLocal[2]!;
      const Sx = c[0]! + R[0]! * lx + R[1]! * ly + R[2]! * lz;
      const Sy = c[1]! + R[3]! * lx + R[4]! * ly + R[5]! * lz;
      const Sz = c[2]! + R[6]! * lx + R[7]! * ly + R[8]! * lz;
      const wx = s.top[0]! - Sx;
      const wy = s.top[1]! - Sy;
      const wz = s.top[2]! - Sz;
      const tx = s.top[0]! - c[0]!;
      const ty = s.top[1]! - c[1]!;
      const tz = s.top[2]! - c[2]!;
      for (let j = 0; j < 2; j++) {
        const e0 = j === 0 ? s.e1 : s.e2;
        const ex = R[0]! * e0[0]! + R[1]! * e0[1]! + R[2]! * e0[2]!;
        const ey = R[3]! * e0[0]! + R[4]! * e0[1]! + R[5]! * e0[2]!;
        const ez = R[6]! * e0[0]! + R[7]! * e0[1]! + R[8]! * e0[2]!;
        const i = m.nDist + j;
        const gi = wx * ex + wy * ey + wz * ez;
        g[i] = gi;
        const a = Math.abs(gi);
        if (a > res) res = a;
        const row = 5 * i;
        J[row] = -ex;
        J[row + 1] = -ey;
        jz[i] = -ez;
        J[row + 2] = ey * tz - ez * ty;
        J[row + 3] = ez * tx - ex * tz;
        J[row + 4] = ex * ty - ey * tx;
      }
    }
    // Driving equation: wheel-centre height (Jacobian e₃, not stored).
    const g5 = c[2]! - zTarget;
    g[5] = g5;
    const a5 = Math.abs(g5);
    if (a5 > res) res = a5;
    this.sc[0] = res;
  }

  /** LU with partial pivoting of the 5×5 J, in place (J then holds L and U), pivots in piv; false if singular. */
  private factor(): boolean {
    return luFactor(this.J, 5, this.piv, 1e-13);
  }

  /**
   * Solves the full 6×6 system J₆·x = b in place (b overwritten with x, in
   * the order δc_x, δc_y, δc_z, δω_x, δω_y, δω_z): δc_z = b[5] from the
   * driving row, then the factored 5×5 for the rest.
   */
  private backSolve(b: Float64Array): void {
    const jz = this.jz;
    const r = this.r5;
    const z = b[5]!;
    for (let i = 0; i < 5; i++) r[i] = b[i]! - jz[i]! * z;
    luSolve(this.J, 5, this.piv, r);
    b[0] = r[0]!;
    b[1] = r[1]!;
    b[2] = z;
    b[3] = r[2]!;
    b[4] = r[3]!;
    b[5] = r[4]!;
  }

  /** c0 ← c, R0 ← R (element loops: TypedArray.set is a builtin call, slow for 3 or 9 numbers). */
  private backup(): void {
    const c = this.c;
    const c0 = this.c0;
    const R = this.R;
    const R0 = this.R0;
    c0[0] = c[0]!;
    c0[1] = c[1]!;
    c0[2] = c[2]!;
    for (let i = 0; i < 9; i++) R0[i] = R[i]!;
  }

  /** c += α·dc, R = exp([α·dω]×)·R0 (Rodrigues), from the backed-up state. */
  private applyStep(dx: Float64Array): void {
    const alpha = this.sc[2]!;
    const c = this.c;
    c[0] = this.c0[0]! + alpha * dx[0]!;
    c[1] = this.c0[1]! + alpha * dx[1]!;
    c[2] = this.c0[2]! + alpha * dx[2]!;
    const w = this.w;
    w[0] = alpha * dx[3]!;
    w[1] = alpha * dx[4]!;
    w[2] = alpha * dx[5]!;
    rotateInto(this.R, this.R0, w);
  }

  /**
   * Moves the state along the stored tangents by Δtravel and Δsteer
   * (predictor). Along a pure travel sweep it integrates the travel tangent
   * interpolated through this pose's and up to three previous poses'
   * tangents (a cubic in travel: the predicted pose is then fourth-order
   * accurate), with the leading rotation-composition terms of
   * R ← exp([Δ]×)·R (Δ = ∫ω − ½∫Δ×ω), so along a fine sweep Newton usually
   * needs no iteration or one.
   */
  predict(dTravel: number, dSteer: number): void {
    const t = this.tTravel;
    const s = this.tSteer;
    const dx = this.dx;
    this.backup();
    const hist = this.hist;
    const x0 = this.travelMm;
    const s1 = hist[0]! - x0;
    const s2 = hist[1]! - x0;
    const s3 = hist[2]! - x0;
    let n = dSteer === 0 && s1 !== 0 ? hist[3]! : 0;
    // Interpolate only near the nodes (a step no longer than four node spacings) and with distinct nodes.
    const near = Math.abs(dTravel) <= 4 * Math.abs(s1);
    const distinct2 = s2 !== 0 && s2 !== s1;
    const distinct3 = distinct2 && s3 !== 0 && s3 !== s1 && s3 !== s2;
    if (n === 3 && !(near && distinct3)) n = 2;
    if (n === 2 && !(near && distinct2)) n = 1;
    if (n >= 1) {
      // ẋ(σ) = t + D1·σ + D2·σ(σ − s1) + D3·σ(σ − s1)(σ − s2), σ = travel − this travel (Newton form).
      const p = this.tPrev;
      const h = dTravel;
      const h2 = h * h;
      const h3 = h2 * h;
      const i1 = 1 / s1;
      const i12 = n >= 2 ? 1 / (s2 - s1) : 0;
      const i2 = n >= 2 ? 1 / s2 : 0;
      const i23 = n === 3 ? 1 / (s3 - s2) : 0;
      const i13 = n === 3 ? 1 / (s3 - s1) : 0;
      const i3 = n === 3 ? 1 / s3 : 0;
      // ∫₀ʰ of the three basis products.
      const k1 = 0.5 * h2;
      const k2 = h3 / 3 - 0.5 * s1 * h2;
      const k3 = 0.25 * h3 * h - ((s1 + s2) * h3) / 3 + 0.5 * s1 * s2 * h2;
      const w = this.w;
      const w2 = this.w2;
      for (let i = 0; i < 6; i++) {
        const t0 = t[i]!;
        const t1 = p[i]!;
        const t2 = p[6 + i]!;
        const t3 = p[12 + i]!;
        const d01 = (t1 - t0) * i1;
        const d12 = (t2 - t1) * i12;
        const d012 = (d12 - d01) * i2;
        const d0123 = ((((t3 - t2) * i23 - d12) * i13) - d012) * i3;
        dx[i] = t0 * h + d01 * k1 + d012 * k2 + d0123 * k3;
        if (i >= 3) {
          // ω′ and ω″ at this pose (rad/mm², rad/mm³), for the composition terms.
          w[i - 3] = d01 - d012 * s1 + d0123 * s1 * s2;
          w2[i - 3] = 2 * (d012 - d0123 * (s1 + s2));
        }
      }
      // Δ −= (h³/12)·ω×ω′ + (h⁴/24)·ω×ω″.
      const c1 = h3 / 12;
      const c2 = (h3 * h) / 24;
      const ox = t[3]!;
      const oy = t[4]!;
      const oz = t[5]!;
      const ax = c1 * w[0]! + c2 * w2[0]!;
      const ay = c1 * w[1]! + c2 * w2[1]!;
      const az = c1 * w[2]! + c2 * w2[2]!;
      dx[3] = dx[3]! - (oy * az - oz * ay);
      dx[4] = dx[4]! - (oz * ax - ox * az);
      dx[5] = dx[5]! - (ox * ay - oy * ax);
    } else {
      for (let i = 0; i < 6; i++) dx[i] = t[i]! * dTravel + s[i]! * dSteer;
    }
    this.sc[2] = 1;
    this.applyStep(dx);
  }

  /**
   * Solves the pose at (travel, steer input) from the current state. Throws
   * SolveError naming travel, rack and the link with the largest residual
   * when no pose exists. On success fills the tangents and returns the
   * number of Newton iterations (see `diagnostics()` for the residual).
   */
  solve(travelMm: number, rackMm: number): number {
    const m = this.model;
    this.sc[3] = rackMm;
    this.setSteer();
    this.sc[1] = m.wc0[2] + travelMm;
    this.evaluate();
    let res = this.sc[0]!;
    let it = 0;
    const dx = this.dx;
    for (;;) {
      if (res < RESIDUAL_TOL_MM) break;
      if (it >= MAX_ITER || !this.factor()) this.fail(travelMm, rackMm, res, it >= MAX_ITER ? 'no_convergence' : 'singular');
      for (let i = 0; i < 6; i++) dx[i] = -this.g[i]!;
      this.backSolve(dx);
      // Limit the step: no more than 0.3 rad of rotation or 100 mm of translation per iteration.
      // (Math.hypot is avoided in the loop: its varargs box doubles on the heap.)
      const rot = Math.sqrt(dx[3]! * dx[3]! + dx[4]! * dx[4]! + dx[5]! * dx[5]!);
      const tr = Math.sqrt(dx[0]! * dx[0]! + dx[1]! * dx[1]! + dx[2]! * dx[2]!);
      const sc = this.sc;
      let alpha = 1;
      if (rot * alpha > 0.3) alpha = 0.3 / rot;
      if (tr * alpha > 100) alpha = 100 / tr;
      sc[2] = alpha;
      this.backup();
      this.applyStep(dx);
      this.evaluate();
      let next = this.sc[0]!;
      let tries = 0;
      while (!(next < res) && tries < 12) {
        sc[2] *= 0.5;
        this.applyStep(dx);
        this.evaluate();
        next = this.sc[0]!;
        tries++;
      }
      res = next;
      it++;
    }
    if (!this.factor()) this.fail(travelMm, rackMm, res, 'singular');
    // Tangents: J·t = −∂g/∂travel = e6; J·t = −∂g/∂s (steer row only).
    const tt = this.tTravel;
    // Keep the previous travel tangent for the second-order predictor (same rack, travel moved).
    const hist = this.hist;
    if (rackMm === this.rackMm && travelMm !== this.travelMm) this.rememberTangent(this.travelMm, tt);
    else hist[3] = 0;
    for (let i = 0; i < 5; i++) tt[i] = 0;
    tt[5] = 1;
    this.backSolve(tt);
    const ts = this.tSteer;
    for (let i = 0; i < 6; i++) ts[i] = 0;
    {
      const k = 3 * m.steerRow;
      const R = this.R;
      const rx = m.localPts[k]!;
      const ry = m.localPts[k + 1]!;
      const rz = m.localPts[k + 2]!;
      const ex = this.c[0]! + R[0]! * rx + R[1]! * ry + R[2]! * rz - this.steerInner[0]!;
      const ey = this.c[1]! + R[3]! * rx + R[4]! * ry + R[5]! * rz - this.steerInner[1]!;
      const ez = this.c[2]! + R[6]! * rx + R[7]! * ry + R[8]! * rz - this.steerInner[2]!;
      const q = this.steerInnerRate;
      ts[m.steerRow] = (ex * q[0]! + ey * q[1]! + ez * q[2]!) / m.lengths[m.steerRow]!;
      this.backSolve(ts);
    }
    this.travelMm = travelMm;
    this.rackMm = rackMm;
    this.iterations = it;
    this.residualMm = res;
    return it;
  }

  /** Drops the predictor's memory of the previous pose (after the state is set from outside). */
  forgetHistory(): void {
    this.hist[3] = 0;
  }

  /**
   * Adds a travel tangent of an earlier converged pose at the current steering
   * input to the predictor's memory (older poses first), so a sweep resumed
   * from a stored pose keeps its higher-order predictor.
   */
  rememberTangent(travelMm: number, tangent: ArrayLike<number>): void {
    const tp = this.tPrev;
    const hist = this.hist;
    if (hist[3]! >= 1 && hist[0] === travelMm) {
      // Same travel as the newest node (a repeated travel): replace it, so the nodes stay distinct.
      for (let i = 0; i < 6; i++) tp[i] = tangent[i]!;
      return;
    }
    for (let i = 0; i < 6; i++) {
      tp[12 + i] = tp[6 + i]!;
      tp[6 + i] = tp[i]!;
      tp[i] = tangent[i]!;
    }
    hist[2] = hist[1]!;
    hist[1] = hist[0]!;
    hist[0] = travelMm;
    hist[3] = hist[3]! < 3 ? hist[3]! + 1 : 3;
  }

  /** Diagnostics of the last solve. */
  diagnostics(): SolveDiagnostics {
    return { converged: true, iterations: this.iterations, residualMm: this.residualMm };
  }

  /**
   * Solves (travel, rack) by continuation from the current pose: first the
   * steering input at the current travel, then the travel, in steps of at
   * most `maxStepMm`, predicting along the tangents. So a failure names the
   * requested rack and the travel at which the linkage stopped closing.
   * Returns the total number of Newton iterations.
   */
  solveTowards(travelMm: number, rackMm: number, maxStepMm = 10): number {
    return this.walk(this.travelMm, rackMm, maxStepMm) + this.walk(travelMm, rackMm, maxStepMm);
  }

  private walk(travelMm: number, rackMm: number, maxStepMm: number): number {
    const dT = travelMm - this.travelMm;
    const dS = rackMm - this.rackMm;
    if (dT === 0 && dS === 0) return 0;
    const n = Math.max(1, Math.ceil(Math.max(Math.abs(dT), Math.abs(dS)) / maxStepMm));
    let iters = 0;
    const t0 = this.travelMm;
    const s0 = this.rackMm;
    for (let i = 1; i <= n; i++) {
      const t = i === n ? travelMm : t0 + (dT * i) / n;
      const s = i === n ? rackMm : s0 + (dS * i) / n;
      this.predict(t - this.travelMm, s - this.rackMm);
      iters += this.solve(t, s);
    }
    return iters;
  }

  private fail(travelMm: number, rackMm: number, res: number, why: 'no_convergence' | 'singular'): never {
    // Name the row with the largest residual: the link that cannot close.
    let worst = 0;
    for (let i = 1; i < 6; i++) if (Math.abs(this.g[i]!) > Math.abs(this.g[worst]!)) worst = i;
    const link = worst === 5 ? 'wheel-centre height (travel beyond the linkage’s reach)' : this.model.linkNames[worst]!;
    const where = `at travel ${round(travelMm)} mm, rack ${round(rackMm)} mm${this.side === 'right' ? ' (right corner)' : ''}`;
    const message =
      why === 'singular'
        ? `Pose cannot be solved ${where}: the links do not locate the upright (singular geometry near the ${link})`
        : `Pose unreachable ${where}: the ${link} cannot close (residual ${round(res)} mm)`;
    // Singular at the design pose itself: the hardpoints never locate the upright (not a reach problem).
    const atDesign = travelMm === 0 && rackMm === 0 && this.travelMm === 0 && this.rackMm === 0;
    const code = why === 'singular' && atDesign ? 'singular_geometry' : 'unreachable_pose';
    throw new SolveError(code, message, { travelMm, rackMm, side: this.side, link, residualMm: res });
  }
}

function round(x: number): number {
  return Math.round(x * 1000) / 1000;
}

/** out = exp([w]×)·R (Rodrigues), w a rotation vector (rad); out and R must differ. */
export function rotateInto(out: Float64Array, R: Float64Array, w: Float64Array): void {
  const wx = w[0]!;
  const wy = w[1]!;
  const wz = w[2]!;
  const th2 = wx * wx + wy * wy + wz * wz;
  let a: number, b: number;
  if (th2 < 1e-4) {
    // sin θ/θ and (1 − cos θ)/θ² by their series (the next terms are below 1e-21 here): no trig calls for the
    // small rotations of predictor and Newton steps.
    a = 1 - (th2 / 6) * (1 - (th2 / 20) * (1 - th2 / 42));
    b = 0.5 - (th2 / 24) * (1 - (th2 / 30) * (1 - th2 / 56));
  } else {
    const th = Math.sqrt(th2);
    a = Math.sin(th) / th;
    b = (1 - Math.cos(th)) / th2;
  }
  // E = I + a[w]× + b[w]×²
  const e00 = 1 - b * (wy * wy + wz * wz);
  const e01 = -a * wz + b * wx * wy;
  const e02 = a * wy + b * wx * wz;
  const e10 = a * wz + b * wx * wy;
  const e11 = 1 - b * (wx * wx + wz * wz);
  const e12 = -a * wx + b * wy * wz;
  const e20 = -a * wy + b * wx * wz;
  const e21 = a * wx + b * wy * wz;
  const e22 = 1 - b * (wx * wx + wy * wy);
  for (let j = 0; j < 3; j++) {
    const r0 = R[j]!;
    const r1 = R[3 + j]!;
    const r2 = R[6 + j]!;
    out[j] = e00 * r0 + e01 * r1 + e02 * r2;
    out[3 + j] = e10 * r0 + e11 * r1 + e12 * r2;
    out[6 + j] = e20 * r0 + e21 * r1 + e22 * r2;
  }
}

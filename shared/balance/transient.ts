/**
 * Step-steer transient of the linear bicycle model: two degrees of freedom
 * (sideslip β, yaw rate r), and three (plus roll φ) when roll inertia and
 * damping are given, integrated with odex (./ode.ts). The 2-DOF closed-form
 * step response is here too, for checking. docs/balance.md §5 (metrics after
 * ISO 7401).
 */
import { InputError } from '../errors.js';
import { G, KPH } from './constants.js';
import { integrateOnGrid } from './ode.js';
import { eigenvalues, matVec, modesOf, solveLinear, type Complex, type Matrix, type Mode } from './linear.js';
import type { AxleCompliance, BalanceCore } from './understeer.js';
import { RAD_PER_DEG } from '../angles.js';

export interface LinearModel {
  dof: 2 | 3;
  /** State names in order. */
  states: string[];
  /** ẋ = A·x + B·δ, δ in rad, states in rad and rad/s. */
  A: Matrix;
  B: number[];
  speedMps: number;
}

export interface BicycleParameters {
  massKg: number;
  yawInertiaKgM2: number;
  cgToFrontM: number;
  cgToRearM: number;
  /** Effective axle cornering stiffnesses, N/rad. */
  frontCorneringStiffnessNPerRad: number;
  rearCorneringStiffnessNPerRad: number;
}

/** 2-DOF model: m·V·(β̇ + r) = F_f + F_r, I_z·ṙ = a·F_f − b·F_r, F_f = C_f(δ − β − a·r/V), F_r = C_r(−β + b·r/V). */
export function bicycleModel2(p: BicycleParameters, speedMps: number): LinearModel {
  const { massKg: m, yawInertiaKgM2: Iz, cgToFrontM: a, cgToRearM: b } = p;
  const Cf = p.frontCorneringStiffnessNPerRad;
  const Cr = p.rearCorneringStiffnessNPerRad;
  const V = speedMps;
  return {
    dof: 2,
    states: ['sideslipRad', 'yawRateRadPerS'],
    A: [
      [-(Cf + Cr) / (m * V), (b * Cr - a * Cf) / (m * V * V) - 1],
      [(b * Cr - a * Cf) / Iz, -(a * a * Cf + b * b * Cr) / (Iz * V)],
    ],
    B: [Cf / (m * V), (a * Cf) / Iz],
    speedMps: V,
  };
}

export interface RollParameters {
  sprungMassKg: number;
  /** h₁, sprung CG above the roll axis, m. */
  sprungCgAboveRollAxisM: number;
  rollInertiaKgM2: number;
  rollDampingNmsPerRad: number;
  rollStiffnessNmPerRad: number;
  gravityTerm: boolean;
  /** Equivalent steer out of the turn per unit body roll from roll steer and roll camber, rad/rad. */
  frontRollSteer: number;
  rearRollSteer: number;
}

/**
 * 3-DOF model (sideslip, yaw, roll): the 2-DOF equations with the sprung
 * mass's roll coupling, m·V(β̇ + r) − m_s·h₁·ṗ = ΣF_y and
 * I_x·ṗ − m_s·h₁·V(β̇ + r) = −(K_φ − m_s·g·h₁)·φ − c_φ·p, the axles steered by
 * −e_i·φ (a linear yaw-roll model in the manner of Segel, from memory).
 */
export function bicycleModel3(p: BicycleParameters, r: RollParameters, speedMps: number): LinearModel {
  const { massKg: m, yawInertiaKgM2: Iz, cgToFrontM: a, cgToRearM: b } = p;
  const Cf = p.frontCorneringStiffnessNPerRad;
  const Cr = p.rearCorneringStiffnessNPerRad;
  const V = speedMps;
  const mh = r.sprungMassKg * r.sprungCgAboveRollAxisM;
  const kRoll = r.rollStiffnessNmPerRad - (r.gravityTerm ? mh * G : 0);
  const ef = r.frontRollSteer;
  const er = r.rearRollSteer;
  const M: Matrix = [
    [m * V, 0, 0, -mh],
    [0, Iz, 0, 0],
    [0, 0, 1, 0],
    [-mh * V, 0, 0, r.rollInertiaKgM2],
  ];
  const A: Matrix = [
    [-(Cf + Cr), (b * Cr - a * Cf) / V - m * V, -(Cf * ef + Cr * er), 0],
    [b * Cr - a * Cf, -(a * a * Cf + b * b * Cr) / V, -(a * Cf * ef - b * Cr * er), 0],
    [0, 0, 0, 1],
    [0, mh * V, -kRoll, -r.rollDampingNmsPerRad],
  ];
  const B = [[Cf], [a * Cf], [0], [0]];
  const Ae = solveLinear(M, A);
  const Be = solveLinear(M, B).map((row) => row[0]!);
  return { dof: 3, states: ['sideslipRad', 'yawRateRadPerS', 'rollRad', 'rollRateRadPerS'], A: Ae, B: Be, speedMps: V };
}

/** Steady state x = −A⁻¹·B·δ. */
export function steadyState(model: LinearModel, steerRad: number): number[] {
  const x = solveLinear(model.A, model.B.map((v) => [v * steerRad]));
  return x.map((row) => -row[0]!);
}

/**
 * Closed-form yaw-rate step response of the 2-DOF model,
 * r(s)/δ(s) = (b1·s + b0)/(s² + a1·s + a0) with b1 = B₂, b0 = A₂₁B₁ − A₁₁B₂,
 * a1 = −tr A, a0 = det A: r(t) = r∞ + transient of the two poles, r(0) = 0,
 * ṙ(0) = b1·δ (common practice; partial fractions, re-derived).
 */
export function closedFormYawRate2(model: LinearModel, steerRad: number): (t: number) => number {
  const [[A11, A12], [A21, A22]] = model.A as [[number, number], [number, number]];
  const [B1, B2] = model.B as [number, number];
  const b1 = B2 * steerRad;
  const b0 = (A21 * B1 - A11 * B2) * steerRad;
  const a1 = -(A11 + A22);
  const a0 = A11 * A22 - A12 * A21;
  const rss = b0 / a0;
  const disc = a1 * a1 - 4 * a0;
  const scale = Math.max(a1 * a1, Math.abs(a0));
  if (Math.abs(disc) <= 1e-12 * scale) {
    const l = -a1 / 2;
    const k1 = -rss;
    const k2 = b1 - l * k1;
    return (t) => rss + (k1 + k2 * t) * Math.exp(l * t);
  }
  if (disc < 0) {
    const s = -a1 / 2;
    const wd = Math.sqrt(-disc) / 2;
    const c1 = -rss;
    const c2 = (b1 - s * c1) / wd;
    return (t) => rss + Math.exp(s * t) * (c1 * Math.cos(wd * t) + c2 * Math.sin(wd * t));
  }
  const sq = Math.sqrt(disc);
  const l1 = (-a1 - sq) / 2;
  const l2 = (-a1 + sq) / 2;
  // k1 + k2 = −r∞, l1·k1 + l2·k2 = b1
  const k2 = (b1 + l1 * rss) / (l2 - l1);
  const k1 = -rss - k2;
  return (t) => rss + k1 * Math.exp(l1 * t) + k2 * Math.exp(l2 * t);
}

export interface StepMetrics {
  /** Time from the step to 90 % of the steady yaw rate, s. */
  responseTimeS: number | null;
  /** Time of the yaw-rate peak, s (null when the response does not overshoot). */
  peakTimeS: number | null;
  /** (peak − steady)/steady, %. */
  overshootPct: number;
  /** Time after which the yaw rate stays within ±2 % of the steady value, s (null = not within the simulated time). */
  settlingTimeS: number | null;
}

/** ISO 7401-style metrics from a sampled response y(t) and its steady value (docs/balance.md §5). */
export function stepMetrics(t: number[], y: number[], steady: number): StepMetrics {
  const n = t.length;
  const u = y.map((v) => v / steady);
  let responseTimeS: number | null = null;
  for (let i = 1; i < n; i++) {
    if (u[i]! >= 0.9) {
      responseTimeS = t[i - 1]! + ((0.9 - u[i - 1]!) / (u[i]! - u[i - 1]!)) * (t[i]! - t[i - 1]!);
      break;
    }
  }
  let iMax = 0;
  for (let i = 1; i < n; i++) if (u[i]! > u[iMax]!) iMax = i;
  let peakTimeS: number | null = null;
  let peak = u[iMax]!;
  if (peak > 1 + 1e-9 && iMax > 0 && iMax < n - 1) {
    // Parabola through the three samples around the largest one.
    const y0 = u[iMax - 1]!;
    const y1 = u[iMax]!;
    const y2 = u[iMax + 1]!;
    const h = t[iMax]! - t[iMax - 1]!;
    const d = y0 - 2 * y1 + y2;
    const off = d !== 0 ? (0.5 * (y0 - y2)) / d : 0;
    peakTimeS = t[iMax]! + off * h;
    peak = y1 - 0.25 * (y0 - y2) * off;
  }
  const overshootPct = peakTimeS === null ? 0 : (peak - 1) * 100;
  let last = -1;
  for (let i = 0; i < n; i++) if (Math.abs(u[i]! - 1) > 0.02) last = i;
  let settlingTimeS: number | null;
  if (last === -1) settlingTimeS = 0;
  else if (last === n - 1) settlingTimeS = null;
  else {
    const e0 = Math.abs(u[last]! - 1);
    const e1 = Math.abs(u[last + 1]! - 1);
    settlingTimeS = t[last]! + ((e0 - 0.02) / (e0 - e1)) * (t[last + 1]! - t[last]!);
  }
  return { responseTimeS, peakTimeS, overshootPct, settlingTimeS };
}

export interface HistoryRow {
  tS: number;
  yawRateDegPerS: number;
  sideslipDeg: number;
  lateralAccelerationG: number;
  rollDeg: number | null;
}

export interface StepResponse extends StepMetrics {
  model: '2-dof' | '3-dof';
  speedKph: number;
  steerDeg: number;
  durationS: number;
  stable: boolean;
  eigenvalues: Complex[];
  modes: Mode[];
  /**
   * 2-DOF: of the model's one second-order characteristic polynomial
   * s² + a1·s + a0 (ω_n = √a0, ζ = a1/(2ω_n); ζ > 1 when both roots are real).
   * 3-DOF: of its lowest-frequency oscillatory mode, null when it has none
   * (its real roots are reported in `modes` as time constants). Hz and –.
   */
  naturalFrequencyHz: number | null;
  dampingRatio: number | null;
  steadyYawRateDegPerS: number;
  steadyRollDeg: number | null;
  history: HistoryRow[];
  odeSteps: number;
}

/** ω_n and ζ of a 2×2 system's characteristic polynomial s² − tr(A)·s + det(A) (null when det A ≤ 0: no natural frequency). */
function secondOrder(A: Matrix): { naturalFrequencyHz: number; dampingRatio: number } | null {
  const a0 = A[0]![0]! * A[1]![1]! - A[0]![1]! * A[1]![0]!;
  const a1 = -(A[0]![0]! + A[1]![1]!);
  if (!(a0 > 0)) return null;
  const w = Math.sqrt(a0);
  return { naturalFrequencyHz: w / (2 * Math.PI), dampingRatio: a1 / (2 * w) };
}

export interface StepOptions {
  steerRad: number;
  durationS: number;
  /** Sampling interval of the metrics, s. */
  sampleS: number;
  /** Every how many samples a history row is kept. */
  historyEvery: number;
}

export function stepResponse(model: LinearModel, o: StepOptions): StepResponse {
  const eigs = eigenvalues(model.A);
  const modes = modesOf(eigs);
  const main = model.dof === 2 ? secondOrder(model.A) : (modes.find((m) => m.oscillatory) ?? null);
  const stable = eigs.every((e) => e.re < 0);
  const ss = steadyState(model, o.steerRad);
  const base = {
    model: model.dof === 2 ? ('2-dof' as const) : ('3-dof' as const),
    speedKph: model.speedMps / KPH,
    steerDeg: o.steerRad / RAD_PER_DEG,
    durationS: o.durationS,
    stable,
    eigenvalues: eigs,
    modes,
    naturalFrequencyHz: main?.naturalFrequencyHz ?? null,
    dampingRatio: main?.dampingRatio ?? null,
    steadyYawRateDegPerS: ss[1]! / RAD_PER_DEG,
    steadyRollDeg: model.dof === 3 ? ss[2]! / RAD_PER_DEG : null,
  };
  if (!stable) {
    return { ...base, responseTimeS: null, peakTimeS: null, overshootPct: 0, settlingTimeS: null, history: [], odeSteps: 0 };
  }
  const n = model.B.length;
  const dx = new Array<number>(n);
  const f = (_t: number, x: number[]) => {
    const out = matVec(model.A, x);
    for (let i = 0; i < n; i++) out[i]! += model.B[i]! * o.steerRad;
    return out;
  };
  const sol = integrateOnGrid(f, new Array<number>(n).fill(0), o.durationS, o.sampleS);
  const yaw = sol.y.map((x) => x[1]!);
  const metrics = stepMetrics(sol.t, yaw, ss[1]!);
  const history: HistoryRow[] = [];
  for (let i = 0; i < sol.t.length; i += o.historyEvery) {
    const x = sol.y[i]!;
    matVec(model.A, x, dx);
    const betaDot = dx[0]! + model.B[0]! * o.steerRad;
    history.push({
      tS: Math.round(sol.t[i]! * 1e9) / 1e9,
      yawRateDegPerS: x[1]! / RAD_PER_DEG,
      sideslipDeg: x[0]! / RAD_PER_DEG,
      lateralAccelerationG: (model.speedMps * (betaDot + x[1]!)) / G,
      rollDeg: model.dof === 3 ? x[2]! / RAD_PER_DEG : null,
    });
  }
  return { ...base, ...metrics, history, odeSteps: sol.steps };
}

/** Effective axle cornering stiffness W_i / D_i, N/rad (D_i in deg/g: the axle's total compliance, or a part of it). */
export function effectiveStiffnessNPerRad(staticLoadN: number, complianceDegPerG: number): number {
  return staticLoadN / (complianceDegPerG * RAD_PER_DEG);
}

export function bicycleParameters(core: BalanceCore, frontDegPerG: number, rearDegPerG: number): BicycleParameters {
  for (const [axle, d] of [['front', frontDegPerG], ['rear', rearDegPerG]] as const) {
    if (!(Math.abs(d) > 1e-9)) {
      throw new InputError(`${axle}: the axle's total cornering compliance is zero (its roll steer and compliances cancel its tyres), so the bicycle model has no finite axle stiffness`, [
        { path: axle, message: 'total cornering compliance is zero' },
      ]);
    }
  }
  return {
    massKg: core.vehicle.massKg,
    yawInertiaKgM2: core.vehicle.yawInertiaKgM2,
    cgToFrontM: core.cgToFrontM,
    cgToRearM: core.wheelbaseM - core.cgToFrontM,
    frontCorneringStiffnessNPerRad: effectiveStiffnessNPerRad(core.front.staticLoadN, frontDegPerG),
    rearCorneringStiffnessNPerRad: effectiveStiffnessNPerRad(core.rear.staticLoadN, rearDegPerG),
  };
}

/** The 2-DOF model with the whole compliance of each axle, and the 3-DOF one with roll steer and roll camber moved onto the roll state. */
export function transientModels(core: BalanceCore, c: { front: AxleCompliance; rear: AxleCompliance }, speedMps: number): { twoDof: LinearModel; threeDof: LinearModel | null } {
  const twoDof = bicycleModel2(bicycleParameters(core, c.front.total, c.rear.total), speedMps);
  const v = core.vehicle;
  if (v.rollInertiaKgM2 === undefined || v.rollDampingNmsPerDeg === undefined) return { twoDof, threeDof: null };
  const phi = core.roll.rollGradientDegPerG;
  const perRoll = (x: AxleCompliance) => (phi !== 0 ? (x.rollSteer + x.rollCamber) / phi : 0);
  const p3 = bicycleParameters(core, c.front.total - c.front.rollSteer - c.front.rollCamber, c.rear.total - c.rear.rollSteer - c.rear.rollCamber);
  const threeDof = bicycleModel3(
    p3,
    {
      sprungMassKg: core.roll.mass.sprungMassKg,
      sprungCgAboveRollAxisM: core.roll.mass.sprungCgAboveRollAxisM,
      rollInertiaKgM2: v.rollInertiaKgM2,
      rollDampingNmsPerRad: v.rollDampingNmsPerDeg / RAD_PER_DEG,
      rollStiffnessNmPerRad: (core.roll.rollStiffness.front.totalNmPerDeg + core.roll.rollStiffness.rear.totalNmPerDeg) / RAD_PER_DEG,
      gravityTerm: core.roll.gravityTerm,
      frontRollSteer: perRoll(c.front),
      rearRollSteer: perRoll(c.rear),
    },
    speedMps,
  );
  return { twoDof, threeDof };
}

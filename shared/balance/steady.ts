/**
 * Steady-state bicycle model versus speed and lateral acceleration
 * (Gillespie, Fundamentals of Vehicle Dynamics, from memory, re-derived;
 * docs/balance.md §4). K in deg/g, speeds in km/h at the API, m/s inside.
 */
import { SolveError } from '../errors.js';
import { G, KPH } from './constants.js';
import { axleStiffnessAt, type BalanceCore } from './understeer.js';
import { RAD_PER_DEG } from '../angles.js';

export interface SpeedCharacteristic {
  regime: 'understeer' | 'oversteer' | 'neutral';
  /** V_char = √(L·g/K) for K > 0, km/h; null otherwise. */
  characteristicSpeedKph: number | null;
  /** V_crit = √(−L·g/K) for K < 0, km/h; above it the linear model is unstable. Null otherwise. */
  criticalSpeedKph: number | null;
  /** True when K is zero (within 1e-9 deg/g): neutral steer, no characteristic speed. */
  neutral: boolean;
  /** Peak yaw-rate gain V_char/(2L) for an understeering car, 1/s. */
  peakYawRateGainPerS: number | null;
}

const NEUTRAL_K_DEG_PER_G = 1e-9;

export function speedCharacteristic(kDegPerG: number, wheelbaseM: number): SpeedCharacteristic {
  if (Math.abs(kDegPerG) <= NEUTRAL_K_DEG_PER_G) {
    return { regime: 'neutral', characteristicSpeedKph: null, criticalSpeedKph: null, neutral: true, peakYawRateGainPerS: null };
  }
  const v = Math.sqrt((wheelbaseM * G) / (Math.abs(kDegPerG) * RAD_PER_DEG));
  if (kDegPerG > 0) return { regime: 'understeer', characteristicSpeedKph: v / KPH, criticalSpeedKph: null, neutral: false, peakYawRateGainPerS: v / (2 * wheelbaseM) };
  return { regime: 'oversteer', characteristicSpeedKph: null, criticalSpeedKph: v / KPH, neutral: false, peakYawRateGainPerS: null };
}

export interface GainRow {
  speedKph: number;
  /** False above the critical speed: the linear model has no steady state there. */
  stable: boolean;
  /** r/δ per road-wheel steer, 1/s. */
  yawRateGainPerS: number | null;
  /** a_y/δ per degree of road-wheel steer, g/deg. */
  lateralAccelerationGainGPerDeg: number | null;
  /** β/δ, deg/deg. */
  sideslipGain: number | null;
  /** The same three per handwheel angle where a steering ratio is given. */
  handwheel: { yawRateGainPerS: number; lateralAccelerationGainGPerDeg: number; sideslipGain: number } | null;
}

export interface GainInputs {
  kDegPerG: number;
  wheelbaseM: number;
  /** CG to rear axle, m. */
  cgToRearM: number;
  /** Total cornering compliance of the rear axle, deg/g (sets the sideslip). */
  rearComplianceDegPerG: number;
  steeringRatio?: number | undefined;
}

/** Gains of the linear model at one speed: r/δ = V/(L + K·V²/g), a_y/δ = (V²/g)/(L + K·V²/g), β/δ = (b − D_r·V²/g)/(L + K·V²/g) (K, D_r in rad/g). */
export function gainsAt(p: GainInputs, speedKph: number): GainRow {
  const V = speedKph * KPH;
  const q = (V * V) / G;
  const den = p.wheelbaseM + p.kDegPerG * RAD_PER_DEG * q;
  if (!(den > 0)) return { speedKph, stable: false, yawRateGainPerS: null, lateralAccelerationGainGPerDeg: null, sideslipGain: null, handwheel: null };
  const yaw = V / den;
  const lat = (q * RAD_PER_DEG) / den;
  const beta = (p.cgToRearM - p.rearComplianceDegPerG * RAD_PER_DEG * q) / den;
  const n = p.steeringRatio;
  return {
    speedKph,
    stable: true,
    yawRateGainPerS: yaw,
    lateralAccelerationGainGPerDeg: lat,
    sideslipGain: beta,
    handwheel: n ? { yawRateGainPerS: yaw / n, lateralAccelerationGainGPerDeg: lat / n, sideslipGain: beta / n } : null,
  };
}

/** Speed where the CG's sideslip crosses zero: V = √(b·g/D_r) (D_r in rad/g), km/h; null when D_r ≤ 0. */
export function sideslipZeroSpeedKph(cgToRearM: number, rearComplianceDegPerG: number): number | null {
  if (!(rearComplianceDegPerG > 0)) return null;
  return Math.sqrt((cgToRearM * G) / (rearComplianceDegPerG * RAD_PER_DEG)) / KPH;
}

export interface SteerCurveRow {
  lateralAccelerationG: number;
  speedKph: number;
  /** Road-wheel steer with cornering stiffness fixed at static loads, deg. */
  linearSteerDeg: number;
  /** Road-wheel steer with load-sensitive tyres (Newton solution), deg. */
  steerDeg: number;
  /** Handwheel angles where a steering ratio is given, deg. */
  linearHandwheelDeg: number | null;
  handwheelDeg: number | null;
  sideslipDeg: number;
  newtonIterations: number;
}

export interface SteerSolution {
  steerDeg: number;
  sideslipDeg: number;
  iterations: number;
}

/**
 * Steady cornering on radius R at lateral acceleration A (g): solves the
 * axle force and yaw-moment balance for road-wheel steer δ and sideslip β by
 * Newton's method, with each axle's cornering stiffness at its loaded tyres
 * (C0 − 2b·ΔW²), camber thrust, and the steer out of the turn from roll steer
 * and compliances (docs/balance.md §4).
 */
export function solveSteadyCornering(core: BalanceCore, radiusM: number, lateralG: number): SteerSolution {
  const { front: f, rear: r } = core;
  const a = core.cgToFrontM;
  const b = core.wheelbaseM - a;
  const arm = { front: a - f.pneumaticTrailM, rear: b + r.pneumaticTrailM };
  const Cf = axleStiffnessAt(f, lateralG);
  const Cr = axleStiffnessAt(r, lateralG);
  const W = core.vehicle.massKg * G;
  const forces = (delta: number, beta: number) => {
    const alphaF = delta - f.steerOutDegPerG * lateralG - beta - (a / radiusM) / RAD_PER_DEG;
    const alphaR = -r.steerOutDegPerG * lateralG - beta + (b / radiusM) / RAD_PER_DEG;
    const Ff = Cf * alphaF - f.camberStiffnessNPerDeg * f.inclinationDegPerG * lateralG;
    const Fr = Cr * alphaR - r.camberStiffnessNPerDeg * r.inclinationDegPerG * lateralG;
    return [Ff + Fr - W * lateralG, Ff * arm.front - Fr * arm.rear] as const;
  };
  // Jacobian of the residuals with respect to (δ, β), N/deg and N·m/deg.
  const j11 = Cf;
  const j12 = -Cf - Cr;
  const j21 = Cf * arm.front;
  const j22 = -Cf * arm.front + Cr * arm.rear;
  const det = j11 * j22 - j12 * j21;
  if (!(Math.abs(det) > 0)) throw new SolveError('singular_geometry', `steady cornering has no solution at ${lateralG} g`, { lateralAccelerationG: lateralG });
  let delta = (core.wheelbaseM / radiusM) / RAD_PER_DEG;
  let beta = 0;
  const tol = 1e-10 * W;
  for (let it = 1; it <= 20; it++) {
    const [r1, r2] = forces(delta, beta);
    if (Math.abs(r1) <= tol && Math.abs(r2) <= tol * core.wheelbaseM) return { steerDeg: delta, sideslipDeg: beta, iterations: it - 1 };
    delta -= (r1 * j22 - r2 * j12) / det;
    beta -= (j11 * r2 - j21 * r1) / det;
  }
  throw new SolveError('no_convergence', `steady cornering did not converge at ${lateralG} g`, { lateralAccelerationG: lateralG });
}

export interface SteerCurve {
  radiusM: number;
  maxLateralAccelerationG: number;
  /** True when the requested range was cut at the model's validity limit. */
  clampedToValidity: boolean;
  rows: SteerCurveRow[];
  /** K read from the slope of the load-sensitive curve (central difference) at the budget's lateral acceleration, deg/g. */
  kFromSlopeDegPerG: number;
  /** Slope of the linear curve, deg/g. */
  linearKDegPerG: number;
}

export function steerCurve(core: BalanceCore, opts: { radiusM: number; maxG: number; points: number; slopeAtG: number; linearKDegPerG: number; limitG: number }): SteerCurve {
  const maxG = Math.min(opts.maxG, 0.98 * opts.limitG);
  const n = core.vehicle.steeringRatio;
  const ackermannDeg = (core.wheelbaseM / opts.radiusM) / RAD_PER_DEG;
  const rows: SteerCurveRow[] = [];
  for (let i = 0; i < opts.points; i++) {
    const A = opts.points === 1 ? maxG : (maxG * i) / (opts.points - 1);
    const s = solveSteadyCornering(core, opts.radiusM, A);
    const lin = ackermannDeg + opts.linearKDegPerG * A;
    rows.push({
      lateralAccelerationG: A,
      speedKph: Math.sqrt(A * G * opts.radiusM) / KPH,
      linearSteerDeg: lin,
      steerDeg: s.steerDeg,
      linearHandwheelDeg: n ? lin * n : null,
      handwheelDeg: n ? s.steerDeg * n : null,
      sideslipDeg: s.sideslipDeg,
      newtonIterations: s.iterations,
    });
  }
  const h = Math.min(1e-3, opts.slopeAtG / 2 || 1e-3);
  const lo = Math.max(0, opts.slopeAtG - h);
  const hi = opts.slopeAtG + h;
  const kFromSlope = (solveSteadyCornering(core, opts.radiusM, hi).steerDeg - solveSteadyCornering(core, opts.radiusM, lo).steerDeg) / (hi - lo);
  return { radiusM: opts.radiusM, maxLateralAccelerationG: maxG, clampedToValidity: maxG < opts.maxG, rows, kFromSlopeDegPerG: kFromSlope, linearKDegPerG: opts.linearKDegPerG };
}

/**
 * The ride model and the bump cost of an axle (issue 13 §2, docs/ride.md):
 * ISO 8608 random roads in the frequency domain (transfer functions of the
 * quarter car, the toe curve, the tyre lag and the bicycle model, integrated
 * over the class's band), discrete events in the time domain (fixed-step
 * fourth-order Runge–Kutta). Pure and synchronous; SI inside, mm/deg/N at the
 * outputs as their names say.
 *
 * Left/right correlation: each wheel is its own quarter car (the bar does not
 * act in in-phase motion and is left out). The steering outputs are given at
 * the two limits of the tracks' correlation: `uncorrelated` (independent left
 * and right tracks with the same spectrum: δ̄ has the variance
 * (g_L² + g_R²)/4·σ_s², the case that steers the axle, used for the bump
 * cost) and `inPhase` (identical tracks: δ̄ = (g_R − g_L)/2·s, which
 * cancels for a symmetric axle straight ahead and remains at the operating
 * steer where the two wheels' toe curves differ).
 */
import type { Corner } from '../schema/corner.js';
import type { Vehicle } from '../schema/vehicle.js';
import { InputError, SolveError } from '../errors.js';
import { steeringStrokeMm } from '../schema/steering-link.js';
import { rackForAxleSteer } from '../kinematics/index.js';
import { G } from '../balance/constants.js';
import { quarterCarGains, quarterCarOf, travelGain, type QuarterCar, type QuarterCarInfo } from './quarter-car.js';
import { roadSpectrum, temporalPsd, ROAD_CLASS_WORDS, ISO8608_BAND, type RoadClass, type RoadSpectrum } from './road.js';
import { ToeCurve, type ToeStatistics, type ToeTable } from './toe.js';
import { lateralGains, lateralModel, type LateralModel } from './lateral.js';
import { RAD_PER_DEG } from '../angles.js';
import type { AxleName } from '../schema/axle.js';

export * from './road.js';
export { quarterCarOf, quarterCarGains, quarterCarRate, travelGain, axleShare, DEFAULT_BODY_DAMPING_RATIO, type QuarterCar, type QuarterCarInfo } from './quarter-car.js';
export { ToeCurve, ToeTable, type ToeStatistics } from './toe.js';
export { lateralModel, lateralGains, DEFAULT_RELAXATION_LENGTH_M, type LateralModel } from './lateral.js';

/** Intervals of the Simpson rule over ln f across the band (even). */
export const SPECTRAL_INTERVALS = 512;

export const RIDE_METHOD = {
  randomRoad:
    'frequency domain: |H(f)|² of the linear quarter car (and of the toe, tyre-lag and bicycle-model chain) times the ISO 8608 temporal PSD, integrated over the band by Simpson’s rule in ln f (512 intervals)',
  events: 'time domain: the same linear quarter car and lateral chain integrated by fixed-step fourth-order Runge–Kutta (step 1 ms, or finer: 1/20 of the bump’s duration, and ω·dt ≤ 0.2 for the wheel-hop mode)',
  correlation:
    'each wheel a quarter car of its own (anti-roll bar inactive); steering given for uncorrelated left and right tracks (used for the bump cost) and for fully correlated in-phase tracks',
  toe: 'toe change through the full kinematics: E[Δtoe²] by 9-point Gauss–Hermite quadrature on the toe curve over the Gaussian wheel travel; the dynamic chain uses the equivalent gain RMS toe / RMS travel',
} as const;

// ---------- random road ----------

export interface RideSpectra {
  /** RMS wheel travel (suspension deflection, wheel relative to body), m. */
  travelRmsM: number;
  bodyAccelerationRmsMS2: number;
  /** RMS dynamic tyre load of one wheel, N. */
  tyreLoadRmsN: number;
}

/**
 * Simpson's rule in u = ln f over [fromHz, toHz] (∫F df = ∫F·f du): calls
 * `evaluate(f)` at each node, then `accumulate(w)` with that node's weight,
 * so the caller sums w·F(f) for as many outputs as it evaluates.
 */
function simpsonLog(fromHz: number, toHz: number, n: number, evaluate: (f: number) => void, accumulate: (w: number) => void): void {
  const h = Math.log(toHz / fromHz) / n;
  for (let i = 0; i <= n; i++) {
    const f = fromHz * Math.exp(i * h);
    evaluate(f);
    accumulate((i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2) * (h / 3) * f);
  }
}

/** Variances of the quarter car's outputs on a road spectrum (band of `road`). */
export function quarterCarSpectra(q: QuarterCar, road: RoadSpectrum, intervals = SPECTRAL_INTERVALS): RideSpectra {
  const g = new Float64Array(3);
  const v = new Float64Array(3);
  let psd = 0;
  simpsonLog(
    road.fromHz,
    road.toHz,
    intervals,
    (f) => {
      quarterCarGains(q, 2 * Math.PI * f, g);
      psd = temporalPsd(road, f);
    },
    (w) => {
      const p = psd * w;
      v[0]! += g[0]! * p;
      v[1]! += g[1]! * p;
      v[2]! += g[2]! * p;
    },
  );
  return { travelRmsM: Math.sqrt(v[0]!), bodyAccelerationRmsMS2: Math.sqrt(v[1]!), tyreLoadRmsN: Math.sqrt(v[2]!) };
}

export interface SteeringRms {
  /** RMS axle steer disturbance δ̄, deg. */
  axleSteerRmsDeg: number;
  /** RMS side force the toe disturbance makes at the axle (tyre lag included), N. */
  sideForceRmsN: number;
  /** RMS yaw-rate disturbance of the vehicle, deg/s; null above the critical speed. */
  yawRateRmsDegPerS: number | null;
  /** RMS lateral acceleration disturbance, m/s²; null above the critical speed. */
  lateralAccelerationRmsMS2: number | null;
}

/**
 * RMS of the steering chain for an axle steer δ̄ = κ·s in spectrum (κ² given
 * per correlation limit, rad²/m²), s the wheel travel of the quarter car.
 */
export function steeringSpectra(q: QuarterCar, lat: LateralModel, axleStiffnessNPerRad: number, road: RoadSpectrum, kappa2: number, intervals = SPECTRAL_INTERVALS): SteeringRms {
  const tg = new Float64Array(2);
  const lg = new Float64Array(3);
  const v = new Float64Array(4);
  let base = 0;
  simpsonLog(
    road.fromHz,
    road.toHz,
    intervals,
    (f) => {
      const w = 2 * Math.PI * f;
      travelGain(q, w, tg);
      lateralGains(lat, axleStiffnessNPerRad, w, lg);
      base = (tg[0]! * tg[0]! + tg[1]! * tg[1]!) * kappa2 * temporalPsd(road, f);
    },
    (wgt) => {
      const p = base * wgt;
      v[0]! += p;
      v[1]! += lg[0]! * p;
      v[2]! += lg[1]! * p;
      v[3]! += lg[2]! * p;
    },
  );
  return {
    axleSteerRmsDeg: Math.sqrt(v[0]!) / RAD_PER_DEG,
    sideForceRmsN: Math.sqrt(v[1]!),
    yawRateRmsDegPerS: lat.unstable ? null : Math.sqrt(v[2]!) / RAD_PER_DEG,
    lateralAccelerationRmsMS2: lat.unstable ? null : Math.sqrt(v[3]!),
  };
}

// ---------- events ----------

export interface EventHistory {
  /** Time step, s, and the number of samples. */
  dtS: number;
  travelMm: Float64Array;
  tyreLoadN: Float64Array;
  bodyAccelerationMS2: Float64Array;
}

/** Duration simulated after the event has passed, s (the bicycle model's yaw settles well within it). */
export const EVENT_SETTLE_S = 2;

/** The quarter car through an event at `speedMps`, by fixed-step RK4 from static equilibrium. */
export function simulateQuarterCar(q: QuarterCar, event: RideEvent, speedMps: number, staticLoadN: number): EventHistory {
  const bumpS = event.kind === 'bump' ? event.lengthMm / 1000 / speedMps : 0;
  // Step: 1 ms, or finer to resolve the bump (20 steps over it) and the wheel-hop mode (ω·dt ≤ 0.2).
  const wHop = Math.sqrt((q.wheelRateNPerM + q.tyreRateNPerM) / q.unsprungMassKg);
  const dt = Math.min(1e-3, bumpS > 0 ? bumpS / 20 : 1e-3, 0.2 / wHop);
  const n = Math.ceil((bumpS + EVENT_SETTLE_S) / dt) + 1;
  const travel = new Float64Array(n);
  const load = new Float64Array(n);
  const acc = new Float64Array(n);
  const ms = q.sprungMassKg;
  const mu = q.unsprungMassKg;
  const k = q.wheelRateNPerM;
  const c = q.damperNsPerM;
  const kt = q.tyreRateNPerM;
  let zs = 0;
  let vs = 0;
  let zu = 0;
  let vu = 0;
  if (event.kind === 'landing') {
    const v0 = Math.sqrt(2 * G * (event.dropHeightMm / 1000));
    vs = -v0;
    vu = -v0;
  }
  const h = event.kind === 'bump' ? event.heightMm / 1000 : 0;
  const len = event.kind === 'bump' ? event.lengthMm / 1000 : 1;
  const kx = Math.PI / len;
  const road = (t: number): number => {
    const x = t * speedMps;
    return x > 0 && x < len ? h * Math.sin(kx * x) : 0;
  };
  // RK4 on [z_s, ż_s, z_u, ż_u] (the equations of quarter-car.ts, written out here for speed).
  for (let i = 0; i < n; i++) {
    const t = i * dt;
    const zr = road(t);
    travel[i] = (zu - zs) * 1000;
    load[i] = staticLoadN + kt * (zr - zu);
    const f1 = k * (zs - zu) + c * (vs - vu);
    acc[i] = -f1 / ms;
    if (i === n - 1) break;
    const zm = road(t + dt / 2);
    const z1 = road(t + dt);
    const a1s = -f1 / ms;
    const a1u = (f1 - kt * (zu - zr)) / mu;
    const zs2 = zs + (dt / 2) * vs;
    const vs2 = vs + (dt / 2) * a1s;
    const zu2 = zu + (dt / 2) * vu;
    const vu2 = vu + (dt / 2) * a1u;
    const f2 = k * (zs2 - zu2) + c * (vs2 - vu2);
    const a2s = -f2 / ms;
    const a2u = (f2 - kt * (zu2 - zm)) / mu;
    const zs3 = zs + (dt / 2) * vs2;
    const vs3 = vs + (dt / 2) * a2s;
    const zu3 = zu + (dt / 2) * vu2;
    const vu3 = vu + (dt / 2) * a2u;
    const f3 = k * (zs3 - zu3) + c * (vs3 - vu3);
    const a3s = -f3 / ms;
    const a3u = (f3 - kt * (zu3 - zm)) / mu;
    const zs4 = zs + dt * vs3;
    const vs4 = vs + dt * a3s;
    const zu4 = zu + dt * vu3;
    const vu4 = vu + dt * a3u;
    const f4 = k * (zs4 - zu4) + c * (vs4 - vu4);
    const a4s = -f4 / ms;
    const a4u = (f4 - kt * (zu4 - z1)) / mu;
    zs += (dt / 6) * (vs + 2 * vs2 + 2 * vs3 + vs4);
    vs += (dt / 6) * (a1s + 2 * a2s + 2 * a3s + a4s);
    zu += (dt / 6) * (vu + 2 * vu2 + 2 * vu3 + vu4);
    vu += (dt / 6) * (a1u + 2 * a2u + 2 * a3u + a4u);
  }
  return { dtS: dt, travelMm: travel, tyreLoadN: load, bodyAccelerationMS2: acc };
}

export interface LateralEventResult {
  peakToeChangeDeg: number;
  peakAxleSteerDeg: number;
  /** Largest side force of the axle (both wheels, tyre lag included), N. */
  peakSideForceN: number;
  /** Largest side force one wheel's toe change asks of its tyre, C(F_z)·|δ| without the lag, N. */
  peakWheelSideForceN: number;
  /** The same as a fraction of that wheel's load at the time, –. */
  peakWheelSideForceFraction: number;
  peakYawRateDegPerS: number | null;
  peakLateralAccelerationMS2: number | null;
  /** Largest |heading change| within the simulated time, deg. */
  headingChangeDeg: number | null;
  /** Heading change at the end of the simulation (the course the driver must correct), deg. */
  finalHeadingChangeDeg: number | null;
  /** Yaw rate at the end of the simulation, deg/s (zero once a passing event has died out). */
  finalYawRateDegPerS: number | null;
}

/**
 * The lateral chain through an event: each wheel's toe from its table at its
 * travel (null = that wheel sees no input), its side force C(F_z)·δ with the
 * tyre's stiffness at the instantaneous load, lagged by σ/V, into the bicycle
 * model; RK4 on the same grid (travel between samples linear).
 */
export function simulateLateral(h: EventHistory, lat: LateralModel, left: ToeTable | null, right: ToeTable | null): LateralEventResult {
  const n = h.travelMm.length;
  const dt = h.dtS;
  const [a11, a12, a21, a22] = lat.A;
  const b1 = 1 / (lat.massKg * lat.speedMps);
  const b2 = lat.leverM / lat.yawInertiaKgM2;
  const tau = lat.lagS;
  // Target force at sample i (and between samples by linear interpolation); also the steer and toe there.
  let tSteer = 0;
  let tToe = 0;
  let tWheelForce = 0;
  let tWheelFraction = 0;
  const target = (i: number, f: number): number => {
    const j = i + 1 < n ? i + 1 : n - 1;
    const s = h.travelMm[i]! * (1 - f) + h.travelMm[j]! * f;
    const fz = h.tyreLoadN[i]! * (1 - f) + h.tyreLoadN[j]! * f;
    const c = lat.wheelStiffnessNPerRad(fz);
    const dl = left ? -left.deltaToeDeg(s) * RAD_PER_DEG : 0;
    const dr = right ? right.deltaToeDeg(s) * RAD_PER_DEG : 0;
    tSteer = (dl + dr) / 2;
    tToe = Math.max(Math.abs(dl), Math.abs(dr));
    tWheelForce = c * tToe;
    tWheelFraction = fz > 0 ? tWheelForce / fz : 0;
    return c * (dl + dr);
  };
  // State: F, β, r, ψ
  let F = 0;
  let beta = 0;
  let r = 0;
  let psi = 0;
  let peakToe = 0;
  let peakSteer = 0;
  let peakF = 0;
  let peakR = 0;
  let peakAy = 0;
  let peakPsi = 0;
  let peakWheelForce = 0;
  let peakWheelFraction = 0;
  const rate = (Fs: number, bs: number, rs: number, Ft: number, out: number[]) => {
    out[0] = (Ft - Fs) / tau;
    out[1] = a11 * bs + a12 * rs + b1 * Fs;
    out[2] = a21 * bs + a22 * rs + b2 * Fs;
    out[3] = rs;
  };
  const k1 = [0, 0, 0, 0];
  const k2 = [0, 0, 0, 0];
  const k3 = [0, 0, 0, 0];
  const k4 = [0, 0, 0, 0];
  let t0 = target(0, 0);
  for (let i = 0; i < n; i++) {
    peakToe = Math.max(peakToe, tToe / RAD_PER_DEG);
    peakSteer = Math.max(peakSteer, Math.abs(tSteer) / RAD_PER_DEG);
    peakWheelForce = Math.max(peakWheelForce, tWheelForce);
    peakWheelFraction = Math.max(peakWheelFraction, tWheelFraction);
    peakF = Math.max(peakF, Math.abs(F));
    peakR = Math.max(peakR, Math.abs(r));
    const betaDot = a11 * beta + a12 * r + b1 * F;
    peakAy = Math.max(peakAy, Math.abs(lat.speedMps * (betaDot + r)));
    peakPsi = Math.max(peakPsi, Math.abs(psi));
    if (i === n - 1) break;
    const tm = target(i, 0.5);
    const t1 = target(i + 1, 0);
    rate(F, beta, r, t0, k1);
    rate(F + (dt / 2) * k1[0]!, beta + (dt / 2) * k1[1]!, r + (dt / 2) * k1[2]!, tm, k2);
    rate(F + (dt / 2) * k2[0]!, beta + (dt / 2) * k2[1]!, r + (dt / 2) * k2[2]!, tm, k3);
    rate(F + dt * k3[0]!, beta + dt * k3[1]!, r + dt * k3[2]!, t1, k4);
    F += (dt / 6) * (k1[0]! + 2 * k2[0]! + 2 * k3[0]! + k4[0]!);
    beta += (dt / 6) * (k1[1]! + 2 * k2[1]! + 2 * k3[1]! + k4[1]!);
    r += (dt / 6) * (k1[2]! + 2 * k2[2]! + 2 * k3[2]! + k4[2]!);
    psi += (dt / 6) * (k1[3]! + 2 * k2[3]! + 2 * k3[3]! + k4[3]!);
    t0 = target(i + 1, 0);
  }
  const ok = !lat.unstable;
  return {
    peakToeChangeDeg: peakToe,
    peakAxleSteerDeg: peakSteer,
    peakSideForceN: peakF,
    peakWheelSideForceN: peakWheelForce,
    peakWheelSideForceFraction: peakWheelFraction,
    peakYawRateDegPerS: ok ? peakR / RAD_PER_DEG : null,
    peakLateralAccelerationMS2: ok ? peakAy : null,
    headingChangeDeg: ok ? peakPsi / RAD_PER_DEG : null,
    finalHeadingChangeDeg: ok ? psi / RAD_PER_DEG : null,
    finalYawRateDegPerS: ok ? r / RAD_PER_DEG : null,
  };
}

// ---------- the axle ----------

export type RideEvent = { kind: 'bump'; heightMm: number; lengthMm: number } | { kind: 'landing'; dropHeightMm: number };

export interface RideOptions {
  axle: AxleName;
  roadClass: RoadClass;
  speedKph: number;
  /** The axle's left corner: toe, side-force and yaw outputs. */
  corner?: Corner | undefined;
  /** Radius of the operating corner, m: a steered axle is also judged at the mean steer L/R it needs. */
  cornerRadiusM?: number | undefined;
  /** Events to simulate: a single-wheel half-sine bump, a landing of both wheels of the axle. */
  bump?: { heightMm: number; lengthMm: number } | undefined;
  landing?: { dropHeightMm: number } | undefined;
  /** Wheel-travel range of the suspension, mm: the toe curve is read inside it (the bump stops). */
  travelRangeMm?: [number, number] | undefined;
  /** Report bump steer at the ends of the steering stroke (information; default true for a steered corner). */
  fullLock?: boolean | undefined;
}

export interface WheelToe extends ToeStatistics {
  side: 'left' | 'right';
}

export interface SteeringCondition {
  condition: 'on-centre' | 'operating-steer' | 'full-lock';
  rackMm: number;
  /** Mean steer of the axle at that rack, deg (0 on-centre). */
  axleSteerDeg: number;
  /** The corner the operating steer stands for, m. */
  cornerRadiusM: number | null;
  wheels: { left: WheelToe; right: WheelToe };
  /** The larger of the two wheels' RMS toe, deg. */
  toeRmsDeg: number;
  uncorrelated: SteeringRms;
  inPhase: SteeringRms;
}

export interface EventResult {
  kind: 'bump' | 'landing';
  heightMm: number;
  lengthMm: number | null;
  /** Which wheels the event lifts: the bump one wheel (left or right, the worse reported), the landing both. */
  wheels: 'one' | 'both';
  /** Largest compression (wheel travel toward bump), mm. */
  peakWheelTravelMm: number;
  /** Largest extension (droop), mm, as a positive number. */
  peakDroopMm: number;
  peakTyreLoadN: number;
  minTyreLoadN: number;
  /** The tyre load reached zero: the linear model no longer holds there. */
  wheelLeavesGround: boolean;
  peakBodyAccelerationMS2: number;
  /** With a corner, on-centre and at the operating steer. */
  steering: (LateralEventResult & { condition: 'on-centre' | 'operating-steer'; rackMm: number; wheel: 'left' | 'right' | 'both' })[];
  /** Shortcut: the on-centre peak toe change, deg (with a corner). */
  peakToeChangeDeg: number | null;
}

export interface RideResult {
  axle: AxleName;
  roadClass: RoadClass;
  roadInWords: string;
  speedKph: number;
  method: typeof RIDE_METHOD;
  road: { gd0M3: number; spatialBandCyclesPerM: [number, number]; temporalBandHz: [number, number] };
  quarterCar: QuarterCarInfo;
  /** RMS wheel travel (suspension deflection, wheel relative to body), mm. */
  wheelTravelRmsMm: number;
  bodyAccelerationRmsMS2: number;
  /** RMS dynamic tyre load of one wheel, N. */
  tyreLoadRmsN: number;
  /** On-centre RMS toe change of a wheel, deg (with a corner). */
  toeRmsDeg: number | null;
  lateral: { relaxationLengthM: number; relaxationSource: 'vehicle' | 'default'; tyreStiffnessLaw: string; axleCorneringStiffnessNPerDeg: number; unstableAtSpeed: boolean } | null;
  steering: SteeringCondition[];
  bump: EventResult | null;
  landing: EventResult | null;
  notes: string[];
}

/** Evaluates the ride and bump cost of one axle of `vehicle` on a road class at a speed. */
export function evaluateRide(vehicle: Vehicle, o: RideOptions): RideResult {
  const V = o.speedKph / 3.6;
  if (!(V > 0)) throw new InputError('speedKph: must be above 0', [{ path: 'speedKph', message: 'must be above 0' }]);
  const { car, info } = quarterCarOf(vehicle, o.axle);
  const road = roadSpectrum(o.roadClass, V);
  const spectra = quarterCarSpectra(car, road);
  const sigmaMm = spectra.travelRmsM * 1000;
  const notes: string[] = [];
  if (info.damperSource === 'default') notes.push(`no ${o.axle}.damper in the vehicle: damper wheel rate set for a body damping ratio of 0.3 (${info.damperWheelRateNsPerMm.toFixed(2)} N·s/mm)`);
  const steering: SteeringCondition[] = [];
  let lat: LateralModel | null = null;
  let axleStiffness = 0;
  const corner = o.corner;
  if (corner) {
    lat = lateralModel(vehicle, o.axle, V);
    axleStiffness = 2 * lat.wheelStiffnessNPerRad(info.staticTyreLoadN);
    if (lat.unstable) notes.push('the linear bicycle model is unstable at this speed (oversteer above the critical speed): no yaw outputs');
    const range = o.travelRangeMm ?? null;
    const condition = (cond: SteeringCondition['condition'], rackMm: number, radius: number | null): SteeringCondition => {
      const l = new ToeCurve(corner, 'left', rackMm, range);
      const r = new ToeCurve(corner, 'right', rackMm, range);
      // Mean steer of the axle from the two wheels' static toe at this rack: δ_L = −toe_L, δ_R = +toe_R (domain.md).
      const axleSteerDeg = rackMm === 0 ? 0 : (-l.staticToeDeg + r.staticToeDeg) / 2;
      const ls = l.gaussian(sigmaMm);
      const rs = r.gaussian(sigmaMm);
      const gl = (ls.equivalentGradientDegPerM * RAD_PER_DEG);
      const gr = (rs.equivalentGradientDegPerM * RAD_PER_DEG);
      const unc = (gl * gl + gr * gr) / 4;
      const inp = ((gr - gl) / 2) ** 2;
      return {
        condition: cond,
        rackMm,
        axleSteerDeg,
        cornerRadiusM: radius,
        wheels: { left: { side: 'left', ...ls }, right: { side: 'right', ...rs } },
        toeRmsDeg: Math.max(ls.rmsDeg, rs.rmsDeg),
        uncorrelated: steeringSpectra(car, lat!, axleStiffness, road, unc),
        inPhase: steeringSpectra(car, lat!, axleStiffness, road, inp),
      };
    };
    steering.push(condition('on-centre', 0, null));
    if (corner.steered && o.cornerRadiusM !== undefined) {
      const steerDeg = (vehicle.wheelbaseMm / 1000 / o.cornerRadiusM) / RAD_PER_DEG;
      const rack = rackForAxleSteer(corner, steerDeg);
      steering.push(condition('operating-steer', rack, o.cornerRadiusM));
    }
    const stroke = steeringStrokeMm(corner);
    if (corner.steered && stroke && o.fullLock !== false) {
      for (const rack of stroke) {
        try {
          steering.push(condition('full-lock', rack, null));
        } catch (e) {
          if (!(e instanceof SolveError)) throw e;
          notes.push(`full lock at rack ${rack} mm: ${e.message}`);
        }
      }
    }
  }
  const runEvent = (event: RideEvent): EventResult => {
    const hist = simulateQuarterCar(car, event, V, info.staticTyreLoadN);
    let pMax = -Infinity;
    let pMin = Infinity;
    let fMax = -Infinity;
    let fMin = Infinity;
    let aMax = 0;
    for (let i = 0; i < hist.travelMm.length; i++) {
      pMax = Math.max(pMax, hist.travelMm[i]!);
      pMin = Math.min(pMin, hist.travelMm[i]!);
      fMax = Math.max(fMax, hist.tyreLoadN[i]!);
      fMin = Math.min(fMin, hist.tyreLoadN[i]!);
      aMax = Math.max(aMax, Math.abs(hist.bodyAccelerationMS2[i]!));
    }
    const out: EventResult = {
      kind: event.kind,
      heightMm: event.kind === 'bump' ? event.heightMm : event.dropHeightMm,
      lengthMm: event.kind === 'bump' ? event.lengthMm : null,
      wheels: event.kind === 'bump' ? 'one' : 'both',
      peakWheelTravelMm: Math.max(0, pMax),
      peakDroopMm: Math.max(0, -pMin),
      peakTyreLoadN: fMax,
      minTyreLoadN: fMin,
      wheelLeavesGround: fMin <= 0,
      peakBodyAccelerationMS2: aMax,
      steering: [],
      peakToeChangeDeg: null,
    };
    if (corner && lat) {
      const range = o.travelRangeMm ?? null;
      const lo = range ? Math.max(range[0], pMin) : pMin;
      const hi = range ? Math.min(range[1], pMax) : pMax;
      for (const s of steering) {
        if (s.condition === 'full-lock') continue;
        const lt = new ToeCurve(corner, 'left', s.rackMm, range).table(lo, hi);
        // Straight ahead the right wheel is the left one's mirror: the same toe curve.
        const rt = s.rackMm === 0 ? lt : new ToeCurve(corner, 'right', s.rackMm, range).table(lo, hi);
        const cond = s.condition;
        if (event.kind === 'bump') {
          const a = simulateLateral(hist, lat, lt, null);
          const b = s.rackMm === 0 ? a : simulateLateral(hist, lat, null, rt);
          const worse = (b.headingChangeDeg ?? b.peakSideForceN) > (a.headingChangeDeg ?? a.peakSideForceN) ? { ...b, wheel: 'right' as const } : { ...a, wheel: 'left' as const };
          out.steering.push({ ...worse, condition: cond, rackMm: s.rackMm });
        } else {
          out.steering.push({ ...simulateLateral(hist, lat, lt, rt), condition: cond, rackMm: s.rackMm, wheel: 'both' });
        }
      }
      out.peakToeChangeDeg = out.steering[0]?.peakToeChangeDeg ?? null;
    }
    return out;
  };
  const bump = o.bump ? runEvent({ kind: 'bump', ...o.bump }) : null;
  const landing = o.landing ? runEvent({ kind: 'landing', ...o.landing }) : null;
  if (bump?.wheelLeavesGround || landing?.wheelLeavesGround) notes.push('the tyre load reaches zero during an event: the wheel leaves the ground and the linear model overstates what follows');
  const onCentre = steering.find((s) => s.condition === 'on-centre');
  return {
    axle: o.axle,
    roadClass: o.roadClass,
    roadInWords: `${ROAD_CLASS_WORDS[o.roadClass]} at ${fmtSpeed(o.speedKph)} km/h`,
    speedKph: o.speedKph,
    method: RIDE_METHOD,
    road: { gd0M3: road.gd0M3, spatialBandCyclesPerM: [ISO8608_BAND[0], ISO8608_BAND[1]], temporalBandHz: [road.fromHz, road.toHz] },
    quarterCar: info,
    wheelTravelRmsMm: sigmaMm,
    bodyAccelerationRmsMS2: spectra.bodyAccelerationRmsMS2,
    tyreLoadRmsN: spectra.tyreLoadRmsN,
    toeRmsDeg: onCentre ? onCentre.toeRmsDeg : null,
    lateral: lat
      ? {
          relaxationLengthM: lat.relaxationLengthM,
          relaxationSource: lat.relaxationSource,
          tyreStiffnessLaw: lat.stiffnessLaw,
          axleCorneringStiffnessNPerDeg: axleStiffness * RAD_PER_DEG,
          unstableAtSpeed: lat.unstable,
        }
      : null,
    steering,
    bump,
    landing,
    notes,
  };
}

function fmtSpeed(kph: number): string {
  return Number.isInteger(kph) ? String(kph) : kph.toFixed(1);
}

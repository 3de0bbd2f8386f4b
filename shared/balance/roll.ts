/**
 * Roll stiffness, roll gradient, suspension roll and lateral load transfer
 * (docs/balance.md §2). SI internally (m, N, rad); results carry their units
 * in their names. Conventions of shared/docs/domain.md.
 */
import type { AntiRollBar, VehicleAxle, Vehicle } from '../schema/vehicle.js';
import { InputError } from '../errors.js';
import { G } from './constants.js';
import type { AxleName } from '../schema/axle.js';
import { RAD_PER_DEG } from '../angles.js';

/** Steel shear modulus, GPa (Shigley, Mechanical Engineering Design, table A-5; common handbook value). */
export const STEEL_SHEAR_MODULUS_GPA = 79.3;

/** Torsional rate of a bar, N·m/rad: k_θ = π(D⁴ − d⁴)G/(32 l) (solid: d = 0). Lengths in m, G in Pa. */
export function barTorsionalRateNmPerRad(outerDiameterM: number, innerDiameterM: number, activeLengthM: number, shearModulusPa: number): number {
  return (Math.PI * (outerDiameterM ** 4 - innerDiameterM ** 4) * shearModulusPa) / (32 * activeLengthM);
}

/** Roll stiffness from a pair of springs, N·m/rad: Kφ = ½·k·MR²·t² (kktse, "Simplified lateral load transfer analysis"). */
export function springRollStiffnessNmPerRad(rateNPerM: number, motionRatio: number, trackM: number): number {
  return 0.5 * rateNPerM * motionRatio * motionRatio * trackM * trackM;
}

/**
 * Bar twist per unit wheel travel, rad/m: the entered `twistRadPerM` (a
 * linked corner's bar geometry), else MR_link / lever from the lever figures.
 */
export function barTwistRadPerM(bar: Extract<AntiRollBar, { outerDiameterMm: number }>): number {
  if (bar.twistRadPerM !== undefined) return bar.twistRadPerM;
  return bar.linkMotionRatio! / (bar.leverLengthMm! / 1000);
}

/**
 * Roll stiffness of an anti-roll bar at the wheels, N·m/rad:
 * Kφ = k_θ·θ_w²·t², θ_w the bar twist per unit wheel travel (kktse, "Simplified lateral load transfer analysis").
 */
export function barRollStiffnessNmPerRad(bar: AntiRollBar, trackM: number): number {
  if ('rollRateNmPerDeg' in bar) return bar.rollRateNmPerDeg / RAD_PER_DEG;
  const kTheta = barTorsionalRateNmPerRad(bar.outerDiameterMm / 1000, (bar.innerDiameterMm ?? 0) / 1000, bar.activeLengthMm / 1000, (bar.shearModulusGPa ?? STEEL_SHEAR_MODULUS_GPA) * 1e9);
  const twist = barTwistRadPerM(bar);
  return kTheta * twist * twist * trackM * trackM;
}

/** Springs in series, e.g. tyres and suspension: K = K_t·K_s/(K_t + K_s) (formuladen, "Roll rate with anti-roll bar"). */
export function seriesStiffness(kTyre: number, kSuspension: number): number {
  if (!Number.isFinite(kTyre)) return kSuspension;
  return (kTyre * kSuspension) / (kTyre + kSuspension);
}

/** Roll stiffness of a tyre pair, N·m/rad: K_t = Kt·t²/2 (Kt = one tyre's vertical rate, N/m). */
export function tyreRollStiffnessNmPerRad(verticalRateNPerM: number, trackM: number): number {
  return 0.5 * verticalRateNPerM * trackM * trackM;
}

export interface AxleRollStiffness {
  /** Springs alone, N·m/deg (0 when the roll stiffness was entered directly). */
  springsNmPerDeg: number;
  barNmPerDeg: number;
  /** Suspension (springs + bar, or the entered value), N·m/deg. */
  suspensionNmPerDeg: number;
  /** Tyre pair, N·m/deg (null = rigid tyres). */
  tyresNmPerDeg: number | null;
  /** Suspension and tyres in series, N·m/deg. */
  totalNmPerDeg: number;
  source: 'springs-and-bar' | 'entered-roll-stiffness';
}

export function axleRollStiffness(axle: VehicleAxle): AxleRollStiffness {
  const t = axle.trackMm / 1000;
  let springs = 0;
  let bar = 0;
  let suspension: number;
  let source: AxleRollStiffness['source'];
  if (axle.rollStiffnessNmPerDeg !== undefined) {
    suspension = axle.rollStiffnessNmPerDeg / RAD_PER_DEG;
    source = 'entered-roll-stiffness';
  } else {
    const s = axle.spring!;
    springs = springRollStiffnessNmPerRad(s.rateNPerMm * 1000, s.motionRatio, t);
    bar = axle.antiRollBar ? barRollStiffnessNmPerRad(axle.antiRollBar, t) : 0;
    suspension = springs + bar;
    source = 'springs-and-bar';
  }
  const tyres = axle.tyre.verticalRateNPerMm !== undefined ? tyreRollStiffnessNmPerRad(axle.tyre.verticalRateNPerMm * 1000, t) : Infinity;
  const total = seriesStiffness(tyres, suspension);
  return {
    springsNmPerDeg: springs * RAD_PER_DEG,
    barNmPerDeg: bar * RAD_PER_DEG,
    suspensionNmPerDeg: suspension * RAD_PER_DEG,
    tyresNmPerDeg: Number.isFinite(tyres) ? tyres * RAD_PER_DEG : null,
    totalNmPerDeg: total * RAD_PER_DEG,
    source,
  };
}

export interface MassProperties {
  massKg: number;
  sprungMassKg: number;
  /** Sprung CG behind the front axle, m. */
  sprungCgToFrontM: number;
  sprungCgHeightM: number;
  /** Roll-axis height under the sprung CG, m. */
  rollAxisHeightAtCgM: number;
  /** h₁: sprung CG height above the roll axis, m. */
  sprungCgAboveRollAxisM: number;
  /** Static axle loads, N. */
  frontLoadN: number;
  rearLoadN: number;
  sprungFrontKg: number;
  sprungRearKg: number;
}

export function massProperties(v: Vehicle, rc: { front: number; rear: number }): MassProperties {
  const L = v.wheelbaseMm / 1000;
  const a = v.cgToFrontAxleMm / 1000;
  const h = v.cgHeightMm / 1000;
  const muf = v.front.unsprungMassKg ?? 0;
  const mur = v.rear.unsprungMassKg ?? 0;
  const huf = (v.front.unsprungCgHeightMm ?? 0) / 1000;
  const hur = (v.rear.unsprungCgHeightMm ?? 0) / 1000;
  const ms = v.massKg - muf - mur;
  const xs = (v.massKg * a - mur * L) / ms;
  const hs = (v.massKg * h - muf * huf - mur * hur) / ms;
  const hra = rc.front + ((rc.rear - rc.front) * xs) / L;
  const W = v.massKg * G;
  return {
    massKg: v.massKg,
    sprungMassKg: ms,
    sprungCgToFrontM: xs,
    sprungCgHeightM: hs,
    rollAxisHeightAtCgM: hra,
    sprungCgAboveRollAxisM: hs - hra,
    frontLoadN: (W * (L - a)) / L,
    rearLoadN: (W * a) / L,
    sprungFrontKg: (ms * (L - xs)) / L,
    sprungRearKg: (ms * xs) / L,
  };
}

/**
 * Roll gradient, rad per m/s² of lateral acceleration:
 * with the gravity term m_s·h₁/(ΣKφ − m_s·g·h₁) (Barton & Fieldhouse; domain.md), without it m_s·h₁/ΣKφ.
 * Throws nothing: a non-positive denominator is reported by the caller as roll instability.
 */
export function rollGradientRadPerMps2(sprungMassKg: number, h1M: number, totalRollStiffnessNmPerRad: number, gravityTerm: boolean): number {
  const denom = totalRollStiffnessNmPerRad - (gravityTerm ? sprungMassKg * G * h1M : 0);
  return (sprungMassKg * h1M) / denom;
}

export interface AxleLoadTransfer {
  /** Per g of lateral acceleration, N (outer wheel gains, inner loses this much). */
  elasticNPerG: number;
  geometricNPerG: number;
  unsprungNPerG: number;
  totalNPerG: number;
}

export interface RollModel {
  gravityTerm: boolean;
  mass: MassProperties;
  rollStiffness: { front: AxleRollStiffness; rear: AxleRollStiffness };
  /** Front share of the total (series) roll stiffness. */
  rollStiffnessFrontShare: number;
  rollGradientDegPerG: number;
  /** Suspension roll (body relative to the axle) per g, deg/g. */
  suspensionRollDegPerG: { front: number; rear: number };
  lateralLoadTransfer: { front: AxleLoadTransfer; rear: AxleLoadTransfer; frontShare: number };
  /** Σ ΔW·t, m·h·a_y and m_s·g·h₁·φ per g, N·m: a breakdown of the roll moments (they balance by construction). */
  rollMomentBalance: { loadTransferMomentNm: number; appliedMomentNm: number; gravityMomentNm: number };
  rollCentreHeightMm: { front: number; rear: number };
}

export function evaluateRoll(v: Vehicle): RollModel {
  const gravityTerm = v.options.rollGravityTerm;
  const rcMm = {
    front: v.front.rollCentreHeightMm,
    rear: v.rear.rollCentreHeightMm,
  };
  const mass = massProperties(v, { front: rcMm.front / 1000, rear: rcMm.rear / 1000 });
  const ks = { front: axleRollStiffness(v.front), rear: axleRollStiffness(v.rear) };
  const kTotal = (ks.front.totalNmPerDeg + ks.rear.totalNmPerDeg) / RAD_PER_DEG;
  const h1 = mass.sprungCgAboveRollAxisM;
  const phiPerMps2 = rollGradientRadPerMps2(mass.sprungMassKg, h1, kTotal, gravityTerm);
  const gravityNmPerRad = gravityTerm ? mass.sprungMassKg * G * h1 : 0;
  if (!(kTotal - gravityNmPerRad > 0)) {
    // The message names the fields, so it reads on its own wherever the error is relayed.
    const message = `front and rear roll stiffness, ${(kTotal * RAD_PER_DEG).toFixed(1)} N·m/deg in total, does not exceed the sprung mass's gravity term ${(gravityNmPerRad * RAD_PER_DEG).toFixed(1)} N·m/deg: the body has no stable roll angle (check cgHeightMm and the roll-centre heights too)`;
    throw new InputError(message, [
      { path: 'front', message: 'roll stiffness too low for the sprung mass and its height above the roll axis' },
      { path: 'rear', message: 'roll stiffness too low for the sprung mass and its height above the roll axis' },
      { path: 'cgHeightMm', message: 'sets the sprung mass height above the roll axis' },
    ]);
  }
  const phiPerG = phiPerMps2 * G; // rad per g
  const axleLt = (name: AxleName): AxleLoadTransfer => {
    const axle = v[name];
    const t = axle.trackMm / 1000;
    const k = ks[name].totalNmPerDeg / RAD_PER_DEG;
    const msAxle = name === 'front' ? mass.sprungFrontKg : mass.sprungRearKg;
    const elastic = (k * phiPerG) / t;
    const geometric = (msAxle * G * (rcMm[name] / 1000)) / t;
    const unsprung = ((axle.unsprungMassKg ?? 0) * G * ((axle.unsprungCgHeightMm ?? 0) / 1000)) / t;
    return { elasticNPerG: elastic, geometricNPerG: geometric, unsprungNPerG: unsprung, totalNPerG: elastic + geometric + unsprung };
  };
  const front = axleLt('front');
  const rear = axleLt('rear');
  const ltMoment = front.totalNPerG * (v.front.trackMm / 1000) + rear.totalNPerG * (v.rear.trackMm / 1000);
  const applied = v.massKg * G * (v.cgHeightMm / 1000);
  const gravity = gravityTerm ? mass.sprungMassKg * G * h1 * phiPerG : 0;
  const suspRoll = (name: AxleName) => (phiPerG * ks[name].totalNmPerDeg) / ks[name].suspensionNmPerDeg / RAD_PER_DEG;
  return {
    gravityTerm,
    mass,
    rollStiffness: ks,
    rollStiffnessFrontShare: ks.front.totalNmPerDeg / (ks.front.totalNmPerDeg + ks.rear.totalNmPerDeg),
    rollGradientDegPerG: phiPerG / RAD_PER_DEG,
    suspensionRollDegPerG: { front: suspRoll('front'), rear: suspRoll('rear') },
    lateralLoadTransfer: { front, rear, frontShare: front.totalNPerG / (front.totalNPerG + rear.totalNPerG) },
    rollMomentBalance: {
      loadTransferMomentNm: ltMoment,
      appliedMomentNm: applied,
      gravityMomentNm: gravity,
    },
    rollCentreHeightMm: rcMm,
  };
}

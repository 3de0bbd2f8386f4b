/**
 * Cornering stiffness of one tyre at loads other than its static load: the
 * one law every part of Rollwise uses (the balance model's load-transfer term
 * and steer curve, the bump side-force figures). docs/balance.md §3.
 *
 * - The vehicle gives `tyre.loadSensitivity` {a, b}: its own quadratic,
 *   C(Fz) = a·Fz − b·Fz² (N/deg, Fz in N).
 * - It gives only the stiffness at the static load (per tyre, or as the axle
 *   tyres' compliance W/Cα): the degressive law of the Magic Formula's
 *   cornering stiffness, C(Fz) = p1·Fz0·sin(2·atan(Fz/(p2·Fz0))) (Pacejka,
 *   Tyre and Vehicle Dynamics, the K_yα term of the Magic Formula, from
 *   memory), scaled so that C(Fz0) equals the entered stiffness at the static
 *   wheel load Fz0. With x = Fz/Fz0 and p = p2 that is the rational form
 *   C(Fz) = C0·x·(1 + p²)/(p² + x²) (sin 2u = 2·tan u/(1 + tan² u)). The
 *   stiffness peaks at Fz = p·Fz0; p = 2 here, a peak at twice the static load
 *   (typical of car and race tyres, from memory; the law is stated with every
 *   result). Twice the static load gives 1.25·C0, not 2·C0 as linear scaling
 *   would.
 */
import type { TyreData } from '../schema/vehicle.js';

/** Load, as a multiple of the static wheel load, at which the default law's stiffness peaks (p in the formula above). */
export const DEGRESSIVE_PEAK_LOAD_RATIO = 2;

export type TyreLoadLaw =
  /** C = a·Fz − b·Fz², the vehicle's own figures. */
  | { kind: 'quadratic'; a: number; b: number }
  /** C = C0·x·(1 + p²)/(p² + x²), x = Fz/Fz0. */
  | { kind: 'degressive'; c0NPerDeg: number; staticLoadN: number; peakLoadRatio: number };

/** The law of one tyre of an axle whose static wheel load is `staticWheelLoadN` (N). */
export function tyreLoadLaw(tyre: TyreData, staticWheelLoadN: number): TyreLoadLaw {
  if (tyre.loadSensitivity) return { kind: 'quadratic', a: tyre.loadSensitivity.a, b: tyre.loadSensitivity.b };
  // Per tyre at its static load: entered, or from the axle tyres' compliance D = W_axle/C_axle = Fz0/C_tyre.
  const c0 = tyre.corneringStiffnessNPerDeg ?? staticWheelLoadN / tyre.axleComplianceDegPerG!;
  return { kind: 'degressive', c0NPerDeg: c0, staticLoadN: staticWheelLoadN, peakLoadRatio: DEGRESSIVE_PEAK_LOAD_RATIO };
}

/** Cornering stiffness of one tyre at vertical load Fz (N), N/deg. */
export function tyreStiffnessAt(law: TyreLoadLaw, fzN: number): number {
  if (law.kind === 'quadratic') return law.a * fzN - law.b * fzN * fzN;
  const x = fzN / law.staticLoadN;
  const p2 = law.peakLoadRatio * law.peakLoadRatio;
  return (law.c0NPerDeg * x * (1 + p2)) / (p2 + x * x);
}

/** dC/dFz of one tyre at Fz, N/deg per N. */
export function tyreStiffnessSlope(law: TyreLoadLaw, fzN: number): number {
  if (law.kind === 'quadratic') return law.a - 2 * law.b * fzN;
  const x = fzN / law.staticLoadN;
  const p2 = law.peakLoadRatio * law.peakLoadRatio;
  return ((law.c0NPerDeg / law.staticLoadN) * (1 + p2) * (p2 - x * x)) / ((p2 + x * x) * (p2 + x * x));
}

/** The law in words, for results and cautions. */
export function describeTyreLoadLaw(law: TyreLoadLaw): string {
  if (law.kind === 'quadratic') return `the vehicle's tyre load sensitivity C = a·Fz − b·Fz² (a = ${law.a} 1/deg, b = ${law.b} 1/(deg·N))`;
  return (
    `a degressive law from the static-load stiffness (${law.c0NPerDeg.toFixed(1)} N/deg at ${law.staticLoadN.toFixed(0)} N): ` +
    `C = C0·x·(1 + p²)/(p² + x²), x = Fz/Fz0, p = ${law.peakLoadRatio} (Magic Formula cornering-stiffness form, peak at ${law.peakLoadRatio}× the static load)`
  );
}

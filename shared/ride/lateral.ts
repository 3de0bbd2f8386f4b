/**
 * Toe disturbance → side force → vehicle response (docs/ride.md §4).
 *
 * The axle steer disturbance δ̄ = (δ_L + δ_R)/2 (δ_L = −Δtoe_L, δ_R = +Δtoe_R,
 * domain.md) pushes the axle sideways with the tyres' cornering stiffness at
 * their load, lagged by the relaxation length σ: (σ/V)·Ḟ + F = C·δ̄. That
 * force enters the linear two-degree-of-freedom bicycle model of the balance
 * model (shared/balance/transient.ts, axle stiffnesses W_i/D_i with the
 * on-centre compliances) at the axle: m·V(β̇ + r) = F_f + F_r + F,
 * I_z·ṙ = a·F_f − b·F_r + x·F (x = a front, −b rear).
 */
import type { Vehicle } from '../schema/vehicle.js';
import { InputError } from '../errors.js';
import { G } from '../balance/constants.js';
import { balanceCore } from '../balance/understeer.js';
import { understeerBudget } from '../balance/understeer.js';
import { bicycleModel2, bicycleParameters } from '../balance/transient.js';
import { describeTyreLoadLaw, tyreLoadLaw, tyreStiffnessAt } from '../balance/tyre.js';
import { DEG_PER_RAD } from '../angles.js';
import type { AxleName } from '../schema/axle.js';

/** Tyre relaxation length used when the vehicle gives none, m (check-values.md: 0.3–0.8 m for car tyres, from memory). */
export const DEFAULT_RELAXATION_LENGTH_M = 0.5;

export interface LateralModel {
  speedMps: number;
  /** Where the disturbance acts: +a (front) or −b (rear), m. */
  leverM: number;
  massKg: number;
  yawInertiaKgM2: number;
  /** ẋ = A·x + B·F, x = [β, r]. */
  A: [number, number, number, number];
  /** Relaxation time constant σ/V, s. */
  lagS: number;
  relaxationLengthM: number;
  relaxationSource: 'vehicle' | 'default';
  /** Cornering stiffness of ONE tyre of the axle as a function of its load, N/rad. */
  wheelStiffnessNPerRad: (loadN: number) => number;
  stiffnessLaw: string;
  /** The linear model is unstable at this speed (oversteer above the critical speed). */
  unstable: boolean;
}

/** The lateral chain of `axle` at `speedMps`. */
export function lateralModel(v: Vehicle, axle: AxleName, speedMps: number): LateralModel {
  const core = balanceCore(v);
  const budget = understeerBudget(core, 0);
  const p = bicycleParameters(core, budget.axleCompliance.front.total, budget.axleCompliance.rear.total);
  const m = bicycleModel2(p, speedMps);
  const A = m.A as [[number, number], [number, number]];
  const tyre = v[axle].tyre;
  const given = tyre.relaxationLengthMm;
  const sigma = given !== undefined ? given / 1000 : DEFAULT_RELAXATION_LENGTH_M;
  const staticLoad = (axle === 'front' ? core.front.staticLoadN : core.rear.staticLoadN) / 2;
  // The one tyre load law of the balance model (shared/balance/tyre.ts): the vehicle's quadratic, or the
  // degressive law from the static-load stiffness.
  const tyreLaw = tyreLoadLaw(tyre, staticLoad);
  const law = (fz: number): number => (fz > 0 ? Math.max(0, tyreStiffnessAt(tyreLaw, fz)) * DEG_PER_RAD : 0);
  const text = `${describeTyreLoadLaw(tyreLaw)}, at the instantaneous load`;
  if (!(law(staticLoad) > 0)) {
    throw new InputError(`vehicle.${axle}.tyre: the tyre has no positive cornering stiffness at its static load`, [{ path: `vehicle.${axle}.tyre`, message: 'no positive cornering stiffness at static load' }]);
  }
  const [[a11, a12], [a21, a22]] = A;
  const det = a11 * a22 - a12 * a21;
  return {
    speedMps,
    leverM: axle === 'front' ? p.cgToFrontM : -p.cgToRearM,
    massKg: p.massKg,
    yawInertiaKgM2: p.yawInertiaKgM2,
    A: [a11, a12, a21, a22],
    lagS: sigma / speedMps,
    relaxationLengthM: sigma,
    relaxationSource: given !== undefined ? 'vehicle' : 'default',
    wheelStiffnessNPerRad: law,
    stiffnessLaw: text,
    unstable: !(a11 + a22 < 0 && det > 0),
  };
}

/**
 * Gains per unit axle steer disturbance δ̄ (rad) at ω, into `out`:
 * [|F|² (N/rad)², |r|² ((rad/s)/rad)², |a_y|² ((m/s²)/rad)²], with C the axle's
 * tyre stiffness (N/rad) at static load.
 */
export function lateralGains(m: LateralModel, axleStiffnessNPerRad: number, w: number, out: Float64Array): void {
  // F = C/(1 + jωτ)
  const den = 1 + w * w * m.lagS * m.lagS;
  const fr = axleStiffnessNPerRad / den;
  const fi = (-axleStiffnessNPerRad * w * m.lagS) / den;
  // (jω·I − A)·x = B·F, B = [1/(mV), x/Iz]
  const b1 = 1 / (m.massKg * m.speedMps);
  const b2 = m.leverM / m.yawInertiaKgM2;
  const [a11, a12, a21, a22] = m.A;
  // M = [[−a11 + jω, −a12], [−a21, −a22 + jω]]
  const m11r = -a11;
  const m22r = -a22;
  // det = (m11r + jω)(m22r + jω) − a12·a21
  const dr = m11r * m22r - w * w - a12 * a21;
  const di = w * (m11r + m22r);
  const dd = dr * dr + di * di;
  // r = (M11·b2 + a21·b1)/det (Cramer, per unit F); β = (M22·b1 + a12·b2)/det
  const rnr = m11r * b2 + a21 * b1;
  const rni = w * b2;
  const rr = (rnr * dr + rni * di) / dd;
  const ri = (rni * dr - rnr * di) / dd;
  const bnr = m22r * b1 + a12 * b2;
  const bni = w * b1;
  const br = (bnr * dr + bni * di) / dd;
  const bi = (bni * dr - bnr * di) / dd;
  // a_y = V·(jω·β + r)
  const ar = m.speedMps * (-w * bi + rr);
  const ai = m.speedMps * (w * br + ri);
  const f2 = fr * fr + fi * fi;
  out[0] = f2;
  out[1] = f2 * (rr * rr + ri * ri);
  out[2] = f2 * (ar * ar + ai * ai);
}

export { G };

/**
 * The quarter car of one wheel: sprung mass m_s on the wheel rate k and the
 * damper wheel rate c, unsprung mass m_u on the tyre rate k_t, linear about
 * static equilibrium (docs/ride.md §2):
 *   m_s·z̈_s = −k(z_s − z_u) − c(ż_s − ż_u)
 *   m_u·z̈_u =  k(z_s − z_u) + c(ż_s − ż_u) − k_t(z_u − z_r)
 * Wheel travel (suspension deflection, + bump) s = z_u − z_s; dynamic tyre
 * load k_t(z_r − z_u). SI units inside (m, kg, N/m, N·s/m).
 */
import { InputError } from '../errors.js';
import type { Vehicle } from '../schema/vehicle.js';
import { G } from '../balance/constants.js';
import type { AxleName } from '../schema/axle.js';

/** Damping ratio of the body mode used when the vehicle gives no damper, – (common practice: passenger cars about 0.2–0.4, from memory). */
export const DEFAULT_BODY_DAMPING_RATIO = 0.3;

export interface QuarterCar {
  sprungMassKg: number;
  unsprungMassKg: number;
  /** Wheel rate k, N/m (spring rate × motion ratio²). */
  wheelRateNPerM: number;
  /** Damper wheel rate c, N·s/m. */
  damperNsPerM: number;
  /** Tyre vertical rate k_t, N/m. */
  tyreRateNPerM: number;
}

export interface QuarterCarInfo {
  sprungMassKg: number;
  unsprungMassKg: number;
  wheelRateNPerMm: number;
  damperWheelRateNsPerMm: number;
  /** `vehicle` (axle.damper) or `default` (body damping ratio 0.3). */
  damperSource: 'vehicle' | 'default';
  tyreRateNPerMm: number;
  /** Static load of one tyre, N. */
  staticTyreLoadN: number;
  /** Body mode √(k_r/m_s)/2π with the ride rate k·k_t/(k + k_t), Hz (uncoupled estimate). */
  bodyFrequencyHz: number;
  /** Wheel-hop mode √((k + k_t)/m_u)/2π, Hz (uncoupled estimate). */
  wheelHopFrequencyHz: number;
  /** c / (2·√(k_r·m_s)), –. */
  bodyDampingRatio: number;
}

/** Static share of the vehicle's weight on the axle. */
export function axleShare(v: Vehicle, axle: AxleName): number {
  const a = v.cgToFrontAxleMm / v.wheelbaseMm;
  return axle === 'front' ? 1 - a : a;
}

/**
 * The quarter car of one wheel of `axle`: sprung mass (m·share − unsprung)/2,
 * unsprung mass unsprung/2, wheel rate spring rate × MR², damper wheel rate
 * from `axle.damper` (else the default body damping ratio), tyre rate from
 * `axle.tyre.verticalRateNPerMm`. The anti-roll bar does not act (in-phase
 * motion). Throws InputError naming the missing field.
 */
export function quarterCarOf(v: Vehicle, axle: AxleName): { car: QuarterCar; info: QuarterCarInfo } {
  const ax = v[axle];
  const need = (ok: boolean, path: string, what: string) => {
    if (!ok) throw new InputError(`vehicle.${axle}.${path}: the ride model needs ${what}`, [{ path: `vehicle.${axle}.${path}`, message: `required by the ride model (${what})` }]);
  };
  need(ax.spring !== undefined, 'spring', 'the spring rate and motion ratio (wheel rate)');
  need(ax.unsprungMassKg !== undefined && ax.unsprungMassKg > 0, 'unsprungMassKg', 'the unsprung mass of the axle');
  need(ax.tyre.verticalRateNPerMm !== undefined, 'tyre.verticalRateNPerMm', "the tyre's vertical rate");
  const axleMass = v.massKg * axleShare(v, axle);
  const mu = ax.unsprungMassKg! / 2;
  const ms = (axleMass - ax.unsprungMassKg!) / 2;
  need(ms > 0, 'unsprungMassKg', 'an unsprung mass below the axle’s static share of the vehicle mass');
  const k = ax.spring!.rateNPerMm * ax.spring!.motionRatio * ax.spring!.motionRatio * 1000;
  const kt = ax.tyre.verticalRateNPerMm! * 1000;
  const kr = (k * kt) / (k + kt);
  const given = ax.damper?.wheelRateNsPerMm;
  const c = given !== undefined ? given * 1000 : 2 * DEFAULT_BODY_DAMPING_RATIO * Math.sqrt(kr * ms);
  const car: QuarterCar = { sprungMassKg: ms, unsprungMassKg: mu, wheelRateNPerM: k, damperNsPerM: c, tyreRateNPerM: kt };
  return {
    car,
    info: {
      sprungMassKg: ms,
      unsprungMassKg: mu,
      wheelRateNPerMm: k / 1000,
      damperWheelRateNsPerMm: c / 1000,
      damperSource: given !== undefined ? 'vehicle' : 'default',
      tyreRateNPerMm: kt / 1000,
      staticTyreLoadN: (axleMass / 2) * G,
      bodyFrequencyHz: Math.sqrt(kr / ms) / (2 * Math.PI),
      wheelHopFrequencyHz: Math.sqrt((k + kt) / mu) / (2 * Math.PI),
      bodyDampingRatio: c / (2 * Math.sqrt(kr * ms)),
    },
  };
}

/**
 * |H|² of the three outputs per unit road displacement at ω (rad/s), written
 * into `out` = [travel (m/m)², body acceleration ((m/s²)/m)², tyre load (N/m)²].
 * Δ = (k + jωc − ω²m_s)(k + k_t + jωc − ω²m_u) − (k + jωc)²;
 * Z_s/Z_r = (k + jωc)·k_t/Δ, Z_u/Z_r = (k + jωc − ω²m_s)·k_t/Δ.
 */
export function quarterCarGains(q: QuarterCar, w: number, out: Float64Array): void {
  const k = q.wheelRateNPerM;
  const kt = q.tyreRateNPerM;
  const cw = q.damperNsPerM * w;
  const w2 = w * w;
  const pr = k - w2 * q.sprungMassKg; // A = pr + j·cw
  const qr = k + kt - w2 * q.unsprungMassKg; // B = qr + j·cw
  // Δ = A·B − C², C = k + j·cw
  const dr = pr * qr - cw * cw - (k * k - cw * cw);
  const di = pr * cw + cw * qr - 2 * k * cw;
  const dd = dr * dr + di * di;
  // Z_s/Z_r = C·k_t/Δ
  const sr = (kt * (k * dr + cw * di)) / dd;
  const si = (kt * (cw * dr - k * di)) / dd;
  // Z_u/Z_r = A·k_t/Δ
  const ur = (kt * (pr * dr + cw * di)) / dd;
  const ui = (kt * (cw * dr - pr * di)) / dd;
  const tr = ur - sr;
  const ti = ui - si;
  out[0] = tr * tr + ti * ti;
  out[1] = w2 * w2 * (sr * sr + si * si);
  out[2] = kt * kt * ((1 - ur) * (1 - ur) + ui * ui);
}

/** Complex travel gain s/z_r at ω, written into out[0] (re), out[1] (im). */
export function travelGain(q: QuarterCar, w: number, out: Float64Array): void {
  const k = q.wheelRateNPerM;
  const kt = q.tyreRateNPerM;
  const cw = q.damperNsPerM * w;
  const w2 = w * w;
  const pr = k - w2 * q.sprungMassKg;
  const qr = k + kt - w2 * q.unsprungMassKg;
  const dr = pr * qr - cw * cw - (k * k - cw * cw);
  const di = pr * cw + cw * qr - 2 * k * cw;
  const dd = dr * dr + di * di;
  // s/z_r = −ω²·m_s·k_t/Δ
  const num = -w2 * q.sprungMassKg * kt;
  out[0] = (num * dr) / dd;
  out[1] = (-num * di) / dd;
}

/** Right-hand side of the quarter car: state y = [z_s, ż_s, z_u, ż_u], road z_r; writes ẏ into `dy` at `o`. */
export function quarterCarRate(q: QuarterCar, y: ArrayLike<number>, o: number, zr: number, dy: Float64Array, d: number): void {
  const zs = y[o]!;
  const vs = y[o + 1]!;
  const zu = y[o + 2]!;
  const vu = y[o + 3]!;
  const f = q.wheelRateNPerM * (zs - zu) + q.damperNsPerM * (vs - vu);
  dy[d] = vs;
  dy[d + 1] = -f / q.sprungMassKg;
  dy[d + 2] = vu;
  dy[d + 3] = (f - q.tyreRateNPerM * (zu - zr)) / q.unsprungMassKg;
}
